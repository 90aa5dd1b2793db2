import { afterAll, describe, expect, it } from 'vitest';
import { throttlePolicy } from '../../../src/lib/auth/throttle';
import { createAccount } from '../../support/accounts';
import { baseUrl } from '../../support/browser';
import { closeTestDb, query } from '../../support/db';
import { attemptSignIn } from '../../support/session';

afterAll(closeTestDb);

const at = (address: string) => ({ 'x-forwarded-for': address });
const outcome = (res: Response) => new URL(res.headers.get('location') ?? '', baseUrl()).searchParams.get('code');
const signedIn = (jar: Map<string, string>) => [...jar.keys()].some((k) => k.endsWith('authjs.session-token'));

// Limits from src/lib/auth/throttle.ts (OWASP Authentication Cheat Sheet; NIST SP 800-63B
// §5.2.2 rate limiting; the numbers are common practice).
describe('brute force is throttled', () => {
  it(`locks an account after ${throttlePolicy.account.limit} failures, even for the right password, from any address`, async () => {
    const acct = await createAccount({ company: 'orrin-bay', role: 'engineer', label: 'lock' });
    for (let i = 0; i < throttlePolicy.account.limit; i++) {
      const { res } = await attemptSignIn(baseUrl(), acct.email, `wrong-${i}`, at(`192.0.2.${10 + i}`));
      expect(outcome(res)).toBe('credentials');
    }
    const locked = await attemptSignIn(baseUrl(), acct.email, acct.password, at('192.0.2.40'));
    expect(outcome(locked.res)).toBe('throttled');
    expect(signedIn(locked.jar)).toBe(false);
    const audit = await query(`select action from audit_log where subject = $1 order by id`, [acct.email]);
    expect(audit.map((r) => r.action)).toEqual([...Array(throttlePolicy.account.limit).fill('signin.failed'), 'signin.throttled']);

    // The lock lifts when the window has passed.
    await query(`update throttle_events set at = at - interval '16 minutes' where key = $1`, [acct.email]);
    const later = await attemptSignIn(baseUrl(), acct.email, acct.password, at('192.0.2.41'));
    expect(signedIn(later.jar)).toBe(true);
  });

  it('locks an unknown address the same way, so the lock reveals nothing', async () => {
    const email = `nobody-${Date.now()}@orrinbay.example.com`;
    for (let i = 0; i < throttlePolicy.account.limit; i++) await attemptSignIn(baseUrl(), email, 'guess', at(`192.0.2.${60 + i}`));
    expect(outcome((await attemptSignIn(baseUrl(), email, 'guess', at('192.0.2.70'))).res)).toBe('throttled');
  });

  it(`blocks an address after ${throttlePolicy.address.limit} failures across accounts; other addresses still get in`, async () => {
    const acct = await createAccount({ company: 'orrin-bay', role: 'operator', label: 'addr' });
    const address = '192.0.2.200';
    for (let i = 0; i < throttlePolicy.address.limit; i++) {
      await attemptSignIn(baseUrl(), `spray-${i}-${Date.now()}@orrinbay.example.com`, 'guess', at(address));
    }
    const blocked = await attemptSignIn(baseUrl(), acct.email, acct.password, at(address));
    expect(outcome(blocked.res)).toBe('throttled');
    expect(signedIn(blocked.jar)).toBe(false);
    const elsewhere = await attemptSignIn(baseUrl(), acct.email, acct.password, at('192.0.2.201'));
    expect(signedIn(elsewhere.jar)).toBe(true);
  });

  it('a correct password clears the account’s failures', async () => {
    const acct = await createAccount({ company: 'orrin-bay', role: 'engineer', label: 'clear' });
    for (let i = 0; i < throttlePolicy.account.limit - 1; i++) await attemptSignIn(baseUrl(), acct.email, 'wrong', at('192.0.2.90'));
    expect(signedIn((await attemptSignIn(baseUrl(), acct.email, acct.password, at('192.0.2.90'))).jar)).toBe(true);
    for (let i = 0; i < throttlePolicy.account.limit - 1; i++) await attemptSignIn(baseUrl(), acct.email, 'wrong', at('192.0.2.91'));
    expect(signedIn((await attemptSignIn(baseUrl(), acct.email, acct.password, at('192.0.2.91'))).jar)).toBe(true);
  });
});
