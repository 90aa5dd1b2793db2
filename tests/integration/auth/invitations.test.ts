import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { INVITATION_DAYS } from '../../../src/lib/accounts/invitations';
import { createAccount, homeIds } from '../../support/accounts';
import { baseUrl } from '../../support/browser';
import { closeTestDb, query } from '../../support/db';
import { linkIn, waitForMail } from '../../support/mail';
import { cookiesFrom, signInAs } from '../../support/session';

afterAll(closeTestDb);

let admin: string;
let engineer: string;
beforeAll(async () => {
  admin = await signInAs(baseUrl(), 'admin');
  engineer = await signInAs(baseUrl(), 'engineer');
});

const call = (
  method: string,
  path: string,
  cookie: string | null,
  body?: unknown,
  headers: Record<string, string> = {},
) =>
  fetch(`${baseUrl()}${path}`, {
    method,
    headers: { 'content-type': 'application/json', origin: baseUrl(), ...(cookie ? { cookie } : {}), ...headers },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
const fresh = (label: string, domain = 'kestrelvale.example.com') =>
  `${label}-${Date.now()}-${Math.floor(Math.random() * 1e6)}@${domain}`;
const tokenOf = (link: string) => new URL(link).searchParams.get('token')!;

async function invite(
  cookie: string,
  path: string,
  body: Record<string, string>,
): Promise<{ id: string; link: string }> {
  const since = new Date();
  const res = await call('POST', path, cookie, body);
  expect(res.status).toBe(201);
  const { invitation } = await res.json();
  const mail = await waitForMail(body.email, /invitation to Heatlayer/, since);
  return { id: invitation.id, link: linkIn(mail, `${baseUrl()}/accept-invitation?token=`) };
}

async function accept(link: string, body: Record<string, string> = {}) {
  const res = await call('POST', '/api/invitations/accept', null, { token: tokenOf(link), ...body });
  const session = cookiesFrom(res).get('authjs.session-token');
  return { res, cookie: session ? `authjs.session-token=${session}` : null };
}

describe('staff invitations', () => {
  it('an admin invites an engineer; the link creates the account, signs it in with that role, and works once', async () => {
    const email = fresh('new-engineer');
    const { link } = await invite(admin, '/api/invitations', { email, name: 'Wren Hollins', role: 'engineer' });
    const page = await fetch(link);
    expect(page.status).toBe(200);
    expect(await page.text()).toContain('Create my account');

    const { res, cookie } = await accept(link, { password: 'a long enough passphrase' });
    expect(res.status).toBe(200);
    const me = await (await call('GET', '/api/me', cookie)).json();
    expect(me).toMatchObject({
      email,
      role: 'engineer',
      companyName: 'Kestrel Vale Heating Co-operative',
      name: 'Wren Hollins',
    });

    const reused = await accept(link, { password: 'a long enough passphrase' });
    expect(reused.res.status).toBe(410);
    expect((await reused.res.json()).error.code).toBe('InvitationUsed');
    expect(reused.cookie).toBeNull();
    expect((await fetch(link)).status).toBe(410);
    const audit = await query(
      `select action from audit_log where (subject = $1 or actor_user_id = $2) and action like 'invitation.%' order by id`,
      [email, me.userId],
    );
    expect(audit.map((r) => r.action)).toEqual(['invitation.created', 'invitation.accepted']);
  });

  it(`refuses an expired invitation (links last ${INVITATION_DAYS} days) and a withdrawn one`, async () => {
    const expired = await invite(admin, '/api/invitations', { email: fresh('late'), role: 'operator' });
    await query(`update invitations set expires_at = now() - interval '1 second' where id = $1`, [expired.id]);
    const late = await accept(expired.link, { password: 'a long enough passphrase' });
    expect(late.res.status).toBe(410);
    expect((await late.res.json()).error.code).toBe('InvitationExpired');
    expect((await fetch(expired.link)).status).toBe(410);

    const withdrawn = await invite(admin, '/api/invitations', { email: fresh('withdrawn'), role: 'operator' });
    expect((await call('DELETE', `/api/invitations/${withdrawn.id}`, admin)).status).toBe(204);
    const refused = await accept(withdrawn.link, { password: 'a long enough passphrase' });
    expect((await refused.res.json()).error.code).toBe('InvitationWithdrawn');
  });

  it('asks a new account for a password, naming the field', async () => {
    const { link } = await invite(admin, '/api/invitations', { email: fresh('nopass'), role: 'engineer' });
    const res = (await accept(link)).res;
    expect(res.status).toBe(400);
    expect((await res.json()).error.fields[0].field).toBe('password');
    // The refusal did not use up the link.
    expect((await accept(link, { password: 'a long enough passphrase' })).res.status).toBe(200);
  });

  it('refuses to invite someone already on the staff, and non-admins may not invite staff', async () => {
    const dup = await call('POST', '/api/invitations', admin, {
      email: 'operator@kestrelvale.example.com',
      role: 'engineer',
    });
    expect(dup.status).toBe(409);
    expect((await call('POST', '/api/invitations', engineer, { email: fresh('x'), role: 'engineer' })).status).toBe(
      403,
    );
    const bad = await call('POST', '/api/invitations', admin, { email: fresh('x'), role: 'householder' });
    expect(bad.status).toBe(400);
    expect((await bad.json()).error.fields[0].field).toBe('role');
  });

  it('refuses an address that already belongs to another company', async () => {
    const other = await createAccount({ company: 'orrin-bay', role: 'engineer', label: 'elsewhere' });
    const { link } = await invite(admin, '/api/invitations', { email: other.email, role: 'operator' });
    const res = (await accept(link)).res;
    expect(res.status).toBe(409);
    expect((await res.json()).error.code).toBe('AccountBelongsElsewhere');
  });

  it('refuses a cross-site request even with a valid session', async () => {
    const evil = await call(
      'POST',
      '/api/invitations',
      admin,
      { email: fresh('csrf'), role: 'admin' },
      { origin: 'https://attacker.example.net' },
    );
    expect(evil.status).toBe(403);
    expect((await evil.json()).error.code).toBe('CrossSiteRequest');
    const res = await fetch(`${baseUrl()}/api/invitations`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', cookie: admin, 'sec-fetch-site': 'cross-site' },
      body: JSON.stringify({ email: fresh('csrf'), role: 'admin' }),
    });
    expect(res.status).toBe(403);
  });
});

describe('householder invitations at handover', () => {
  it('an engineer invites the householder of a home; they see that home only', async () => {
    const [, secondHome] = await homeIds('kestrel-vale');
    const email = fresh('householder');
    const { link } = await invite(engineer, `/api/homes/${secondHome}/invitations`, { email });
    const { res, cookie } = await accept(link, { name: 'Calla Ivers', password: 'a long enough passphrase' });
    expect(res.status).toBe(200);
    const me = await (await call('GET', '/api/me', cookie)).json();
    expect(me).toMatchObject({ role: 'householder', homeIds: [secondHome] });
    const listed = await (await call('GET', `/api/homes/${secondHome}/invitations`, engineer)).json();
    expect(listed.householders.map((h: { email: string }) => h.email)).toContain(email);
  });

  it('an existing householder invited to a second home keeps one account and sees both', async () => {
    const [firstHome, secondHome] = await homeIds('kestrel-vale', 3).then((ids) => [ids[1], ids[2]]);
    const person = await createAccount({
      company: 'kestrel-vale',
      role: 'householder',
      homeId: firstHome,
      label: 'two-homes',
    });
    const { link } = await invite(engineer, `/api/homes/${secondHome}/invitations`, { email: person.email });
    expect(await (await fetch(link)).text()).toContain('Accept and sign in');
    const { cookie } = await accept(link);
    const me = await (await call('GET', '/api/me', cookie)).json();
    expect([...me.homeIds].sort()).toEqual([firstHome, secondHome].sort());
  });

  it('answers 404 for another company’s home, with nothing about it', async () => {
    const [orrinHome] = await homeIds('orrin-bay', 1);
    const res = await call('POST', `/api/homes/${orrinHome}/invitations`, engineer, { email: fresh('x') });
    expect(res.status).toBe(404);
    expect(await query(`select 1 from invitations where home_id = $1`, [orrinHome])).toEqual([]);
  });
});
