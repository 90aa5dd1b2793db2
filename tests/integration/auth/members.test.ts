import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createAccount } from '../../support/accounts';
import { baseUrl } from '../../support/browser';
import { closeTestDb, query } from '../../support/db';
import { signIn, signInAs } from '../../support/session';

afterAll(closeTestDb);

let kvAdmin: string;
let obAdmin: string;
beforeAll(async () => {
  kvAdmin = await signInAs(baseUrl(), 'admin', 'kestrel-vale');
  obAdmin = await signInAs(baseUrl(), 'admin', 'orrin-bay');
});

const call = (method: string, path: string, cookie: string, body?: unknown) =>
  fetch(`${baseUrl()}${path}`, {
    method,
    headers: { 'content-type': 'application/json', origin: baseUrl(), cookie },
    body: body === undefined ? undefined : JSON.stringify(body),
  });

describe('staff roles', () => {
  it('a role change ends the member’s sessions at once; signed in again they have the new role; it is audited', async () => {
    const member = await createAccount({ company: 'kestrel-vale', role: 'engineer', label: 'promote' });
    const session = await signIn(baseUrl(), member.email, member.password);
    const other = await signIn(baseUrl(), member.email, member.password);
    expect((await call('GET', '/api/audit', session)).status).toBe(403);
    const res = await call('PATCH', `/api/members/${member.id}`, kvAdmin, { role: 'admin' });
    expect(res.status).toBe(200);
    for (const old of [session, other]) expect((await call('GET', '/api/me', old)).status).toBe(401);
    const fresh = await signIn(baseUrl(), member.email, member.password);
    expect((await call('GET', '/api/me', fresh).then((r) => r.json())).role).toBe('admin');
    expect((await call('GET', '/api/audit', fresh)).status).toBe(200);
    const [row] = await query(`select detail from audit_log where action = 'member.role_changed' and subject = $1`, [
      `user:${member.id}`,
    ]);
    expect(row.detail).toEqual({ from: 'engineer', to: 'admin', sessionsEnded: 2 });
  });

  it('never leaves the company without an administrator', async () => {
    const [admin] = await query<{ id: string }>(`select u.id from "user" u where email = 'admin@orrinbay.example.com'`);
    const res = await call('PATCH', `/api/members/${admin.id}`, obAdmin, { role: 'operator' });
    expect(res.status).toBe(409);
    expect((await res.json()).error.code).toBe('LastAdministrator');
    expect((await call('GET', '/api/me', obAdmin).then((r) => r.json())).role).toBe('admin');
  });

  it('another company’s admin gets 404 for our staff, and nothing changes', async () => {
    const member = await createAccount({ company: 'kestrel-vale', role: 'operator', label: 'foreign' });
    expect((await call('PATCH', `/api/members/${member.id}`, obAdmin, { role: 'admin' })).status).toBe(404);
    expect((await call('DELETE', `/api/members/${member.id}`, obAdmin)).status).toBe(404);
    const [m] = await query(`select role from memberships where user_id = $1`, [member.id]);
    expect(m.role).toBe('operator');
  });

  it('a removed member loses access at once, and their old session stays ended if they are taken back', async () => {
    const member = await createAccount({ company: 'kestrel-vale', role: 'operator', label: 'remove' });
    const session = await signIn(baseUrl(), member.email, member.password);
    expect((await call('DELETE', `/api/members/${member.id}`, kvAdmin)).status).toBe(204);
    expect((await call('GET', '/api/me', session)).status).toBe(401);
    // Taken back (a new invitation would do this): the copied cookie still opens nothing.
    await query(`insert into memberships (user_id, company_id, role) values ($1, $2, 'operator')`, [
      member.id,
      member.companyId,
    ]);
    expect((await call('GET', '/api/me', session)).status).toBe(401);
    expect((await call('GET', '/api/me', await signIn(baseUrl(), member.email, member.password))).status).toBe(200);
  });

  it('the audit log shows an admin their own company only', async () => {
    const { entries } = await (await call('GET', '/api/audit?limit=500', kvAdmin)).json();
    const [kv] = await query<{ id: string }>(`select id from companies where slug = 'kestrel-vale'`);
    expect(entries.length).toBeGreaterThan(0);
    expect(new Set(entries.map((e: { companyId: string }) => e.companyId))).toEqual(new Set([kv.id]));
  });
});
