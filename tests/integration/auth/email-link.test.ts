import { afterAll, describe, expect, it } from 'vitest';
import { SIGN_IN_LINK_MINUTES } from '../../../src/lib/auth/config';
import { createAccount } from '../../support/accounts';
import { baseUrl } from '../../support/browser';
import { closeTestDb, query } from '../../support/db';
import { linkIn, mailTo, waitForMail } from '../../support/mail';
import { cookieHeader, cookiesFrom, csrf } from '../../support/session';

afterAll(closeTestDb);

async function askForLink(email: string): Promise<Response> {
  const { token, jar } = await csrf(baseUrl());
  return fetch(`${baseUrl()}/api/auth/signin/nodemailer`, {
    method: 'POST',
    redirect: 'manual',
    headers: { 'content-type': 'application/x-www-form-urlencoded', origin: baseUrl(), cookie: cookieHeader(jar) },
    body: new URLSearchParams({ csrfToken: token, email, callbackUrl: '/' }),
  });
}

async function follow(link: string): Promise<{ res: Response; cookie: string | null }> {
  const res = await fetch(link, { redirect: 'manual' });
  const jar = cookiesFrom(res);
  const session = jar.get('authjs.session-token');
  return { res, cookie: session ? `authjs.session-token=${session}` : null };
}

const linkSentPage = '/api/auth/verify-request?provider=nodemailer&type=email';

describe('sign-in by e-mail link (API, fake mail server)', () => {
  it('mails a link that signs the person in, once', async () => {
    const acct = await createAccount({ company: 'kestrel-vale', role: 'engineer', password: null, label: 'link' });
    const since = new Date();
    const asked = await askForLink(acct.email);
    expect(asked.status).toBe(302);
    expect(asked.headers.get('location')).toBe(`${baseUrl()}${linkSentPage}`);
    const mail = await waitForMail(acct.email, /sign-in link/, since);
    expect(mail.text).toContain(`within ${SIGN_IN_LINK_MINUTES} minutes`);
    const link = linkIn(mail, `${baseUrl()}/api/auth/callback/nodemailer`);

    const first = await follow(link);
    expect(first.res.status).toBe(302);
    expect(first.cookie).not.toBeNull();
    const me = await fetch(`${baseUrl()}/api/me`, { headers: { cookie: first.cookie! } });
    expect((await me.json()).email).toBe(acct.email);

    const again = await follow(link);
    expect(again.cookie).toBeNull();
    expect(again.res.headers.get('location')).toBe(`${baseUrl()}/signin?error=Verification`);
    const audit = await query(`select detail from audit_log where action = 'signin.succeeded' and actor_user_id = $1`, [
      acct.id,
    ]);
    expect(audit.map((r) => r.detail.method)).toEqual(['link']);
  });

  it('refuses an expired link', async () => {
    const acct = await createAccount({ company: 'kestrel-vale', role: 'operator', label: 'expired-link' });
    const since = new Date();
    await askForLink(acct.email);
    const link = linkIn(await waitForMail(acct.email, /sign-in link/, since), baseUrl());
    await query(`update "verificationToken" set expires = now() - interval '1 minute' where identifier = $1`, [
      acct.email,
    ]);
    const { res, cookie } = await follow(link);
    expect(cookie).toBeNull();
    expect(res.headers.get('location')).toBe(`${baseUrl()}/signin?error=Verification`);
  });

  it('answers an unknown address exactly like a known one, and sends nothing', async () => {
    const email = `stranger-${Date.now()}@kestrelvale.example.com`;
    const res = await askForLink(email);
    expect(res.status).toBe(302);
    expect(res.headers.get('location')).toBe(`${baseUrl()}${linkSentPage}`);
    await new Promise((r) => setTimeout(r, 1000));
    expect(mailTo(email)).toEqual([]);
    expect(await query(`select 1 from "verificationToken" where identifier = $1`, [email])).toEqual([]);
    expect(await query(`select 1 from "user" where email = $1`, [email])).toEqual([]);
  });
});
