// Throwaway accounts for tests that lock, change or remove them (never the shared demo accounts).
import { randomUUID } from 'node:crypto';
import { hash } from '@node-rs/argon2';
import type { Role } from '../../src/db/schema/companies';
import { query } from './db';
import type { DemoCompanySlug } from './session';

export interface TestAccount {
  id: string;
  email: string;
  password: string;
  companyId: string;
}

export async function companyId(slug: DemoCompanySlug): Promise<string> {
  const [row] = await query<{ id: string }>('select id from companies where slug = $1', [slug]);
  return row.id;
}

/** Homes of a company, oldest first (the first one is the demo householder's). */
export async function homeIds(slug: DemoCompanySlug, n = 2): Promise<string[]> {
  const rows = await query<{ id: string }>(
    `select h.id from homes h join companies c on c.id = h.company_id where c.slug = $1 order by h.reference limit $2`,
    [slug, n],
  );
  return rows.map((r) => r.id);
}

export async function createAccount(opts: {
  company: DemoCompanySlug;
  role: Role;
  homeId?: string;
  password?: string | null;
  label?: string;
}): Promise<TestAccount> {
  const cid = await companyId(opts.company);
  const email = `${opts.label ?? 'test'}-${randomUUID().slice(0, 8)}@${opts.company === 'kestrel-vale' ? 'kestrelvale' : 'orrinbay'}.example.com`;
  const password = opts.password === undefined ? `pw-${randomUUID()}` : opts.password;
  const [u] = await query<{ id: string }>(
    `insert into "user" (id, email, name, password_hash, "emailVerified") values ($1, $2, $3, $4, now()) returning id`,
    [randomUUID(), email, `Test ${opts.role}`, password ? await hash(password) : null],
  );
  await query('insert into memberships (user_id, company_id, role) values ($1, $2, $3)', [u.id, cid, opts.role]);
  if (opts.homeId) await query('insert into home_members (home_id, user_id) values ($1, $2)', [opts.homeId, u.id]);
  return { id: u.id, email, password: password ?? '', companyId: cid };
}
