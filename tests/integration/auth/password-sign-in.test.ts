import { afterAll, describe, expect, it } from 'vitest';
import { baseUrl } from '../../support/browser';
import { closeTestDb, query } from '../../support/db';
import { attemptSignIn, demoEmail, demoPassword, signIn } from '../../support/session';

afterAll(closeTestDb);

// Each test acts from its own invented address (TEST-NET-3, RFC 5737) so the per-address
// throttle of one test does not spill into another.
const from = (n: number) => ({ 'x-forwarded-for': `203.0.113.${n}` });

describe('password sign-in through Auth.js (API)', () => {
  it('signs a demo account in and the session shows who it is', async () => {
    const cookie = await signIn(baseUrl(), demoEmail('operator', 'kestrel-vale'), demoPassword());
    const session = await (await fetch(`${baseUrl()}/api/auth/session`, { headers: { cookie } })).json();
    expect(session.user.email).toBe('operator@kestrelvale.example.com');
    const me = await (await fetch(`${baseUrl()}/api/me`, { headers: { cookie } })).json();
    expect(me).toMatchObject({
      email: 'operator@kestrelvale.example.com',
      role: 'operator',
      companyName: 'Kestrel Vale Heating Co-operative',
      homeIds: null,
    });
  });

  it('refuses a wrong password and an unknown address with the same answer', async () => {
    const wrong = await attemptSignIn(baseUrl(), demoEmail('engineer', 'orrin-bay'), 'not-the-password', from(11));
    const unknown = await attemptSignIn(baseUrl(), 'nobody@orrinbay.example.com', 'not-the-password', from(11));
    expect(wrong.res.status).toBe(302);
    expect(wrong.res.headers.get('location')).toBe(`${baseUrl()}/signin?error=CredentialsSignin&code=credentials`);
    expect(unknown.res.headers.get('location')).toBe(wrong.res.headers.get('location'));
    for (const r of [wrong, unknown]) expect([...r.jar.keys()].some((k) => k.includes('session-token'))).toBe(false);
  });

  it('records sign-ins and failures in the audit log of the account’s company', async () => {
    await signIn(baseUrl(), demoEmail('engineer', 'kestrel-vale'), demoPassword());
    const rows = await query(
      `select a.action, a.detail from audit_log a join companies c on c.id = a.company_id
      where c.slug = 'kestrel-vale' and a.subject = (select 'user:' || id from "user" where email = $1) order by a.id desc limit 1`,
      ['engineer@kestrelvale.example.com'],
    );
    expect(rows[0]?.action).toBe('signin.succeeded');
    expect(rows[0]?.detail.method).toBe('password');
  });
});
