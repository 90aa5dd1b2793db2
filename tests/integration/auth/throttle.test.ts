import { afterAll, describe, expect, it } from 'vitest';
import { throttlePolicy } from '../../../src/lib/auth/throttle';
import { createAccount } from '../../support/accounts';
import { baseUrl } from '../../support/browser';
import { closeTestDb, query } from '../../support/db';
import { attemptSignIn } from '../../support/session';

afterAll(closeTestDb);

// The web server under test trusts loopback as a proxy (scripts/lib/services.ts), so each test
// acts from its own invented addresses (RFC 5737 documentation ranges) through X-Forwarded-For.
let next = 0;
const run = Date.now() % 200;
/** A fresh address per call, within 192.0.2.0/24 and 198.51.100.0/24, not reused in this file. */
const freshAddress = () => {
  const n = run + next++;
  return `${n % 2 ? '192.0.2' : '198.51.100'}.${((n >> 1) % 250) + 1}`;
};
const at = (address: string) => ({ 'x-forwarded-for': address });
const outcome = (res: Response) => new URL(res.headers.get('location') ?? '', baseUrl()).searchParams.get('code');
const signedIn = (jar: Map<string, string>) => [...jar.keys()].some((k) => k.endsWith('authjs.session-token'));
/** Moves every counted failure of a key back in time, as if the wait had passed. */
const age = (key: string, seconds: number) =>
  query(`update throttle_events set at = at - make_interval(secs => $2) where key = $1`, [key, seconds]);

async function clean(...addresses: string[]) {
  await query(`delete from throttle_events where key = any($1::text[]) or split_part(key, ' ', 2) = any($1::text[])`, [
    addresses,
  ]);
}

async function failTimes(email: string, address: string, n: number) {
  for (let i = 0; i < n; i++)
    expect(outcome((await attemptSignIn(baseUrl(), email, `wrong-${i}`, at(address))).res)).toBe('credentials');
}

// Limits from src/lib/auth/throttle.ts (OWASP Authentication Cheat Sheet, "Protect against
// automated attacks"; NIST SP 800-63B §5.2.2 rate limiting; the numbers are common practice).
const { freeFailures } = throttlePolicy.accountAddress;

describe('brute force is throttled per account and address, with growing delays', () => {
  it(`after ${freeFailures} failures from one address, that address waits (429, Retry-After); the person at their own address still gets in`, async () => {
    const acct = await createAccount({ company: 'orrin-bay', role: 'engineer', label: 'pair' });
    const attacker = freshAddress();
    const usual = freshAddress();
    await clean(attacker, usual);
    await failTimes(acct.email, attacker, freeFailures);

    const held = await attemptSignIn(baseUrl(), acct.email, acct.password, at(attacker));
    expect(held.res.status).toBe(429);
    const wait = Number(held.res.headers.get('retry-after'));
    expect(wait).toBeGreaterThan(50);
    expect(wait).toBeLessThanOrEqual(60);
    const body = await held.res.json();
    expect(body.error).toMatchObject({ code: 'TooManyAttempts', retryAfterS: wait });
    expect(body.error.message).toMatch(/Try again in 1 minute/);
    expect(signedIn(held.jar)).toBe(false);

    // The account holder, from their usual address, is not locked out by the attacker's guesses.
    const owner = await attemptSignIn(baseUrl(), acct.email, acct.password, at(usual));
    expect(signedIn(owner.jar)).toBe(true);

    const audit = await query(
      `select action, detail->>'address' as address from audit_log where subject in ($1, $2) order by id`,
      [acct.email, `user:${acct.id}`],
    );
    expect(audit.map((r) => `${r.action} ${r.address}`)).toEqual([
      ...Array(freeFailures).fill(`signin.failed ${attacker}`),
      `signin.throttled ${attacker}`,
      `signin.succeeded ${usual}`,
    ]);
  });

  it('doubles the wait with each further failure, and lifts it when the wait has passed', async () => {
    const acct = await createAccount({ company: 'orrin-bay', role: 'engineer', label: 'backoff' });
    const address = freshAddress();
    await clean(address);
    const key = `${acct.email} ${address}`;
    await failTimes(acct.email, address, freeFailures);
    await age(key, 61);
    // The first wait (1 minute) has passed: one more guess is checked, fails, and earns 2 minutes.
    await failTimes(acct.email, address, 1);
    const second = await attemptSignIn(baseUrl(), acct.email, acct.password, at(address));
    expect(second.res.status).toBe(429);
    expect(Number(second.res.headers.get('retry-after'))).toBeGreaterThan(110);
    expect(Number(second.res.headers.get('retry-after'))).toBeLessThanOrEqual(120);
    await age(key, 121);
    const later = await attemptSignIn(baseUrl(), acct.email, acct.password, at(address));
    expect(signedIn(later.jar)).toBe(true);
    // Signing in cleared the pair's count: the next wrong password is free again.
    expect(Number((await query(`select count(*) from throttle_events where key = $1`, [key]))[0].count)).toBe(0);
  });

  it('holds an unknown address the same way, so the wait reveals nothing', async () => {
    const email = `nobody-${Date.now()}@orrinbay.example.com`;
    const address = freshAddress();
    await clean(address);
    await failTimes(email, address, freeFailures);
    expect((await attemptSignIn(baseUrl(), email, 'guess', at(address))).res.status).toBe(429);
  });

  it('sends a browser’s form post back to the sign-in page, saying how long to wait', async () => {
    const acct = await createAccount({ company: 'orrin-bay', role: 'engineer', label: 'page' });
    const address = freshAddress();
    await clean(address);
    await failTimes(acct.email, address, freeFailures);
    const held = await attemptSignIn(baseUrl(), acct.email, acct.password, {
      ...at(address),
      'sec-fetch-mode': 'navigate',
      accept: 'text/html',
    });
    expect(held.res.status).toBe(302);
    expect(Number(held.res.headers.get('retry-after'))).toBeGreaterThan(50);
    const location = new URL(held.res.headers.get('location')!, baseUrl());
    expect(location.pathname).toBe('/signin');
    expect(location.searchParams.get('code')).toBe('throttled');
    const page = await (await fetch(location)).text();
    expect(page).toMatch(/Too many failed sign-ins from this network\. Try again in 1 minute/);
  });

  it(`blocks an address after ${throttlePolicy.address.limit} failures across accounts; other addresses still get in`, async () => {
    const acct = await createAccount({ company: 'orrin-bay', role: 'operator', label: 'addr' });
    const address = freshAddress();
    const other = freshAddress();
    await clean(address, other);
    for (let i = 0; i < throttlePolicy.address.limit; i++) {
      await attemptSignIn(baseUrl(), `spray-${i}-${Date.now()}@orrinbay.example.com`, 'guess', at(address));
    }
    const blocked = await attemptSignIn(baseUrl(), acct.email, acct.password, at(address));
    expect(blocked.res.status).toBe(429);
    expect(signedIn(blocked.jar)).toBe(false);
    const elsewhere = await attemptSignIn(baseUrl(), acct.email, acct.password, at(other));
    expect(signedIn(elsewhere.jar)).toBe(true);
  });

  it('a correct password clears that address’s failures for the account', async () => {
    const acct = await createAccount({ company: 'orrin-bay', role: 'engineer', label: 'clear' });
    const address = freshAddress();
    await clean(address);
    for (let round = 0; round < 2; round++) {
      await failTimes(acct.email, address, freeFailures - 1);
      expect(signedIn((await attemptSignIn(baseUrl(), acct.email, acct.password, at(address))).jar)).toBe(true);
    }
  });
});
