import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { testPortBase } from '../../scripts/lib/ports';

// Every server the product starts listens on loopback only. Read the kernel's socket tables
// (/proc/net/tcp, tcp6: state 0A is LISTEN) for the ports of this test run's block.
function listeners(): { addr: string; port: number }[] {
  const out: { addr: string; port: number }[] = [];
  for (const file of ['/proc/net/tcp', '/proc/net/tcp6']) {
    let text = '';
    try {
      text = readFileSync(file, 'utf8');
    } catch {
      continue;
    }
    for (const line of text.trim().split('\n').slice(1)) {
      const cols = line.trim().split(/\s+/);
      if (cols[3] !== '0A') continue;
      const [addrHex, portHex] = cols[1].split(':');
      out.push({ addr: addrHex, port: parseInt(portHex, 16) });
    }
  }
  return out;
}

const LOOPBACK_V4 = '0100007F'; // 127.0.0.1, little-endian as the kernel prints it
const LOOPBACK_V6 = '00000000000000000000000001000000'; // ::1

describe('network exposure', () => {
  it('listens on loopback only for every port the product uses', () => {
    const base = testPortBase();
    const ours = listeners().filter((l) => l.port >= base && l.port < base + 10);
    // PostgreSQL and the web server at least are up while the tests run.
    expect(ours.map((l) => l.port)).toEqual(expect.arrayContaining([base, base + 1]));
    for (const l of ours) expect([LOOPBACK_V4, LOOPBACK_V6], `port ${l.port} listens on ${l.addr}`).toContain(l.addr);
  });
});
