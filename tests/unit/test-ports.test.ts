// The test port block stays out of the kernel's ephemeral range, where outgoing connections take
// local ports at random (Linux default 32768–60999: kernel Documentation/networking/ip-sysctl.rst,
// ip_local_port_range; IANA dynamic ports 49152–65535: RFC 6335 §6).
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import {
  DEFAULT_TEST_PORT_BASE,
  ephemeralPortRange,
  portBlockProblem,
  TEST_PORT_BLOCK,
  testPortBase,
} from '../../scripts/lib/ports';

const linuxDefault = [32768, 60999] as const;

describe('test port block', () => {
  it("by default lies below this machine's ephemeral range and the IANA dynamic range", () => {
    const range = ephemeralPortRange() ?? linuxDefault;
    const base = testPortBase({}, range);
    expect(base).toBe(DEFAULT_TEST_PORT_BASE);
    expect(base + TEST_PORT_BLOCK - 1).toBeLessThan(range[0]);
    expect(base + TEST_PORT_BLOCK - 1).toBeLessThan(49152);
  });

  it("this run's block lies outside the ephemeral range too", () => {
    const range = ephemeralPortRange() ?? linuxDefault;
    const base = testPortBase(process.env, range);
    expect(base + TEST_PORT_BLOCK <= range[0] || base > range[1]).toBe(true);
  });

  it('refuses a base whose block overlaps the range, naming the setting and a base that works', () => {
    expect(portBlockProblem(55400, linuxDefault)).toMatch(
      /HEATLAYER_TEST_PORT_BASE=55400.*overlap.*32768–60999.*25400/,
    );
    expect(portBlockProblem(32700, linuxDefault)).toMatch(/overlap/); // straddles the low end
    expect(portBlockProblem(60950, linuxDefault)).toMatch(/overlap/); // straddles the high end
    expect(portBlockProblem(32668, linuxDefault)).toBeNull(); // last port 32767
    expect(portBlockProblem(61000, linuxDefault)).toBeNull();
    expect(portBlockProblem(80, linuxDefault)).toMatch(/between 1024 and 65535/);
    expect(() => testPortBase({ HEATLAYER_TEST_PORT_BASE: '55700' }, linuxDefault)).toThrow(
      /HEATLAYER_TEST_PORT_BASE=55700/,
    );
    expect(() => testPortBase({ HEATLAYER_TEST_PORT_BASE: 'abc' }, linuxDefault)).toThrow(
      /HEATLAYER_TEST_PORT_BASE=NaN/,
    );
  });

  it("reads the kernel's range as two numbers", () => {
    const range = ephemeralPortRange();
    if (range === null) return; // not Linux
    expect(range[0]).toBeLessThan(range[1]);
    expect(ephemeralPortRange('/no/such/file')).toBeNull();
  });

  it('no test or benchmark names a fixed port in the ephemeral range', () => {
    const root = new URL('../..', import.meta.url).pathname;
    const files: string[] = [];
    const walk = (dir: string) => {
      for (const name of readdirSync(dir)) {
        const p = join(dir, name);
        if (statSync(p).isDirectory()) walk(p);
        else if (/\.(ts|mjs)$/.test(name) && p !== new URL(import.meta.url).pathname) files.push(p); // not this file's examples
      }
    };
    walk(join(root, 'tests'));
    const offenders: string[] = [];
    for (const file of files) {
      readFileSync(file, 'utf8')
        .split('\n')
        .forEach((line, i) => {
          if (!/port|listen/i.test(line)) return;
          for (const m of line.matchAll(/\b\d{5}\b/g)) {
            const n = Number(m[0]);
            if (n >= linuxDefault[0] && n <= 65535) offenders.push(`${file.slice(root.length)}:${i + 1}: ${n}`);
          }
        });
    }
    expect(offenders).toEqual([]);
  });
});
