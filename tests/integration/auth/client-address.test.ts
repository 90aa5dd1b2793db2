// A web server started as `npm start` starts it, with no trusted proxy configured: a forged
// X-Forwarded-For changes nothing. The address recorded and throttled is the connection's own.
// (The suite's shared web server trusts loopback as a proxy, so it cannot show this.)
import { spawn, type ChildProcess } from 'node:child_process';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildDir } from '../../../scripts/lib/build';
import { closeTestDb, query } from '../../support/db';
import { eventually } from '../../support/eventually';
import { attemptSignIn } from '../../support/session';

// Own port in this run's block (see DEVELOPERS.md: tests with their own servers take base+10 and up).
const port = Number(process.env.PG_PORT) + 40;
const url = `http://127.0.0.1:${port}`;
let web: ChildProcess;
let log = '';

beforeAll(async () => {
  const env = { ...process.env, PORT: String(port), AUTH_URL: url, TRUSTED_PROXIES: '', TRUST_PROXY: '0' };
  web = spawn(process.execPath, ['--import', 'tsx', 'scripts/web-server.ts', join(buildDir(), 'server/entry.mjs')], {
    env,
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  web.stdout!.on('data', (d) => {
    log += d;
  });
  web.stderr!.on('data', (d) => {
    log += d;
  });
  await eventually(
    () =>
      fetch(`${url}/api/health`).then(
        (r) => r.ok,
        () => false,
      ),
    (ok) => ok,
    30_000,
    `the second web server (log: ${log})`,
  );
}, 40_000);

afterAll(async () => {
  web?.kill('SIGTERM');
  await closeTestDb();
});

describe('with no trusted proxy', () => {
  it('ignores a forged X-Forwarded-For: the audit log and the throttle see the real address', async () => {
    const email = `forged-${Date.now()}@orrinbay.example.com`;
    const startedAt = new Date();
    const { res } = await attemptSignIn(url, email, 'guess', { 'x-forwarded-for': '203.0.113.66' });
    expect(new URL(res.headers.get('location') ?? '', url).searchParams.get('code')).toBe('credentials');
    const [entry] = await query(
      `select detail->>'address' as address from audit_log where subject = $1 and action = 'signin.failed'`,
      [email],
    );
    expect(entry.address).toBe('127.0.0.1');
    const keys = await query<{ key: string }>(
      `select key from throttle_events where at >= $1 and (key = $2 or key like $3)`,
      [startedAt, '203.0.113.66', `${email} %`],
    );
    expect(keys.map((k) => k.key)).toEqual([`${email} 127.0.0.1`]);
    // Leave loopback's per-address count as it was for the rest of the suite.
    await query(`delete from throttle_events where kind = 'address' and key = '127.0.0.1' and at >= $1`, [startedAt]);
  });

  it('ignores a forged X-Forwarded-Proto: the session cookie is not marked for HTTPS', async () => {
    const res = await fetch(`${url}/api/auth/csrf`, { headers: { 'x-forwarded-proto': 'https' } });
    expect(res.headers.getSetCookie().some((l) => l.startsWith('__Host-') || /;\s*secure/i.test(l))).toBe(false);
  });
});
