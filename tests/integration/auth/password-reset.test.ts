import { afterAll, describe, expect, it } from 'vitest';
import { PASSWORD_MIN_LENGTH } from '../../../src/lib/accounts/schemas';
import { createAccount } from '../../support/accounts';
import { baseUrl } from '../../support/browser';
import { closeTestDb, query } from '../../support/db';
import { linkIn, mailTo, waitForMail } from '../../support/mail';
import { attemptSignIn, cookiesFrom, signIn } from '../../support/session';

afterAll(closeTestDb);

const post = (path: string, body: unknown, headers: Record<string, string> = {}) =>
  fetch(`${baseUrl()}${path}`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', origin: baseUrl(), ...headers },
    body: JSON.stringify(body),
  });
const tokenOf = (link: string) => new URL(link).searchParams.get('token')!;

async function resetLinkFor(email: string): Promise<string> {
  const since = new Date();
  const res = await post('/api/password-resets', { email });
  expect(res.status).toBe(202);
  return linkIn(await waitForMail(email, /new Heatlayer password/, since), `${baseUrl()}/reset-password?token=`);
}

describe('forgotten password', () => {
  it('gives the same answer for an unknown address and sends nothing', async () => {
    const acct = await createAccount({ company: 'orrin-bay', role: 'engineer', label: 'reset-known' });
    const known = await post('/api/password-resets', { email: acct.email });
    const nobody = `nobody-${Date.now()}@orrinbay.example.com`;
    const unknown = await post('/api/password-resets', { email: nobody });
    expect(unknown.status).toBe(known.status);
    expect(await unknown.json()).toEqual(await known.json());
    await new Promise((r) => setTimeout(r, 800));
    expect(mailTo(nobody)).toEqual([]);
    expect(mailTo(acct.email)).toHaveLength(1);
  });

  it('names the field when the address is not an address', async () => {
    const res = await post('/api/password-resets', { email: 'not an address' });
    expect(res.status).toBe(400);
    expect((await res.json()).error.fields[0].field).toBe('email');
  });

  it('sets a new password once, signs in, and signs out every other session', async () => {
    const acct = await createAccount({ company: 'orrin-bay', role: 'operator', label: 'reset' });
    const oldSession = await signIn(baseUrl(), acct.email, acct.password);
    const link = await resetLinkFor(acct.email);
    expect((await fetch(link)).status).toBe(200);

    const short = await post('/api/password-resets/complete', {
      token: tokenOf(link),
      password: 'x'.repeat(PASSWORD_MIN_LENGTH - 1),
    });
    expect(short.status).toBe(400);
    expect((await short.json()).error.fields).toEqual([
      { field: 'password', message: expect.stringContaining(`${PASSWORD_MIN_LENGTH} characters`) },
    ]);

    const newPassword = 'a brand new passphrase';
    const done = await post('/api/password-resets/complete', { token: tokenOf(link), password: newPassword });
    expect(done.status).toBe(200);
    const jar = cookiesFrom(done);
    expect(done.headers.getSetCookie().find((l) => l.startsWith('authjs.session-token='))).toMatch(
      /HttpOnly.*SameSite=Lax|SameSite=Lax.*HttpOnly/i,
    );
    const me = await fetch(`${baseUrl()}/api/me`, {
      headers: { cookie: `authjs.session-token=${jar.get('authjs.session-token')}` },
    });
    expect((await me.json()).email).toBe(acct.email);

    expect((await fetch(`${baseUrl()}/api/me`, { headers: { cookie: oldSession } })).status).toBe(401);
    const withOld = await attemptSignIn(baseUrl(), acct.email, acct.password, { 'x-forwarded-for': '192.0.2.150' });
    expect(withOld.res.headers.get('location')).toContain('code=credentials');
    await signIn(baseUrl(), acct.email, newPassword);

    const reused = await post('/api/password-resets/complete', {
      token: tokenOf(link),
      password: 'yet another passphrase',
    });
    expect(reused.status).toBe(410);
    expect((await reused.json()).error.code).toBe('ResetLinkUsed');
    expect((await fetch(link)).status).toBe(410);
    const audit = await query(
      `select action from audit_log where subject = $1 and action like 'password.%' order by id`,
      [`user:${acct.id}`],
    );
    expect(audit.map((r) => r.action)).toEqual(['password.reset_requested', 'password.reset']);
  });

  it('refuses an expired link and a made-up one', async () => {
    const acct = await createAccount({ company: 'orrin-bay', role: 'engineer', label: 'reset-expired' });
    const link = await resetLinkFor(acct.email);
    await query(`update password_resets set expires_at = now() - interval '1 minute' where user_id = $1`, [acct.id]);
    const res = await post('/api/password-resets/complete', {
      token: tokenOf(link),
      password: 'a brand new passphrase',
    });
    expect(res.status).toBe(410);
    expect((await res.json()).error.code).toBe('ResetLinkExpired');
    expect((await fetch(link)).status).toBe(410);
    const madeUp = await post('/api/password-resets/complete', {
      token: 'x'.repeat(43),
      password: 'a brand new passphrase',
    });
    expect(madeUp.status).toBe(404);
  });
});
