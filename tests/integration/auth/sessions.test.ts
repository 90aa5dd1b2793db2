// Sessions end on the server (a password reset's effect is in password-reset.test.ts, a role
// change's and a removal's in members.test.ts): a copied session cookie stops working the moment its session is
// ended (OWASP Session Management Cheat Sheet, "Session expiration" and "Manual session
// expiration": the server must invalidate the session, not only the browser drop its cookie).
import { randomUUID } from 'node:crypto';
import { afterAll, describe, expect, it } from 'vitest';
import { createAccount, homeIds } from '../../support/accounts';
import { baseUrl } from '../../support/browser';
import { closeTestDb, query } from '../../support/db';
import { signIn, signOut } from '../../support/session';

afterAll(closeTestDb);

const call = (method: string, path: string, cookie: string, body?: unknown) =>
  fetch(`${baseUrl()}${path}`, {
    method,
    redirect: 'manual',
    headers: { 'content-type': 'application/json', origin: baseUrl(), cookie },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
const me = (cookie: string) => call('GET', '/api/me', cookie);

/** A tank of its own in one of the company's homes, so commands sent here disturb no other test. */
async function spareTank(): Promise<string> {
  const [home] = await homeIds('kestrel-vale', 1);
  const [t] = await query<{ id: string }>(
    `insert into tanks (company_id, home_id, serial, model, volume_l, height_m, sensor_count, heat_source)
    select company_id, id, $2, 'C210 cylinder', 210, 1.4, 12, 'hp_plate' from homes where id = $1 returning id`,
    [home, `SESSION-${randomUUID().slice(0, 12)}`],
  );
  return t.id;
}

describe('signing out ends the session on the server', () => {
  it('a cookie copied before sign-out is refused afterwards: GET /api/me 401, commands refused', async () => {
    const acct = await createAccount({ company: 'kestrel-vale', role: 'engineer', label: 'signout' });
    const tankId = await spareTank();
    const cookie = await signIn(baseUrl(), acct.email, acct.password);
    const copied = cookie;
    expect((await me(cookie)).status).toBe(200);
    expect(
      (await call('POST', `/api/tanks/${tankId}/commands`, cookie, { kind: 'boost', minutes: 30 })).status,
    ).toBeLessThan(300);

    const out = await signOut(baseUrl(), cookie);
    expect(out.status).toBe(302);
    expect(out.headers.get('location')).toContain('/signin?signedOut=1');

    const replay = await me(copied);
    expect(replay.status).toBe(401);
    expect((await replay.json()).error.code).toBe('SignInRequired');
    expect((await call('POST', `/api/tanks/${tankId}/commands`, copied, { kind: 'boost', minutes: 30 })).status).toBe(
      401,
    );
    expect((await call('GET', '/tanks', copied)).headers.get('location')).toMatch(/^\/signin\?next=/);
    const [{ n }] = await query<{ n: number }>(`select count(*)::int as n from user_sessions where user_id = $1`, [
      acct.id,
    ]);
    expect(n).toBe(0);
  });

  it('signing out in one browser leaves the person’s other sessions working', async () => {
    const acct = await createAccount({ company: 'kestrel-vale', role: 'operator', label: 'two-browsers' });
    const laptop = await signIn(baseUrl(), acct.email, acct.password);
    const phone = await signIn(baseUrl(), acct.email, acct.password);
    await signOut(baseUrl(), laptop);
    expect((await me(laptop)).status).toBe(401);
    expect((await me(phone)).status).toBe(200);
  });
});

describe('sign out everywhere', () => {
  it('POST /api/me/sessions/revoke ends this and every other session of the person, and no one else’s', async () => {
    const acct = await createAccount({ company: 'kestrel-vale', role: 'engineer', label: 'everywhere' });
    const bystander = await createAccount({ company: 'kestrel-vale', role: 'engineer', label: 'bystander' });
    const here = await signIn(baseUrl(), acct.email, acct.password);
    const elsewhere = await signIn(baseUrl(), acct.email, acct.password);
    const theirs = await signIn(baseUrl(), bystander.email, bystander.password);

    const res = await call('POST', '/api/me/sessions/revoke', here);
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({ sessionsEnded: 2 });
    // This browser's cookie is cleared too.
    expect(
      res.headers
        .getSetCookie()
        .some(
          (l) =>
            /^authjs\.session-token=;|^authjs\.session-token=deleted/.test(l) ||
            (/^authjs\.session-token=/.test(l) && /expires=Thu, 01 Jan 1970|max-age=0/i.test(l)),
        ),
    ).toBe(true);

    expect((await me(here)).status).toBe(401);
    expect((await me(elsewhere)).status).toBe(401);
    expect((await me(theirs)).status).toBe(200);
    const [row] = await query(`select action, detail from audit_log where subject = $1 and action = 'sessions.ended'`, [
      `user:${acct.id}`,
    ]);
    expect(row.detail).toEqual({ sessionsEnded: 2 });
    // Signing in again works as usual.
    expect((await me(await signIn(baseUrl(), acct.email, acct.password))).status).toBe(200);
  });

  it('answers a plain form post by going to the sign-in page, and refuses a signed-out caller and another site', async () => {
    const acct = await createAccount({ company: 'kestrel-vale', role: 'householder', label: 'form' });
    const cookie = await signIn(baseUrl(), acct.email, acct.password);
    const crossSite = await fetch(`${baseUrl()}/api/me/sessions/revoke`, {
      method: 'POST',
      headers: { cookie, origin: 'http://attacker.example.net' },
    });
    expect(crossSite.status).toBe(403);
    expect((await me(cookie)).status).toBe(200);

    const form = await fetch(`${baseUrl()}/api/me/sessions/revoke`, {
      method: 'POST',
      redirect: 'manual',
      headers: {
        cookie,
        origin: baseUrl(),
        'content-type': 'application/x-www-form-urlencoded',
        'sec-fetch-mode': 'navigate',
        accept: 'text/html',
      },
    });
    expect(form.status).toBe(303);
    expect(form.headers.get('location')).toBe('/signin?signedOut=everywhere');
    expect((await me(cookie)).status).toBe(401);
    expect((await call('POST', '/api/me/sessions/revoke', cookie)).status).toBe(401);
  });
});
