// A company of its own for the hardening tests (invented, example.com): its staff and householder
// signed in, a home with a tank and an open alert, and fresh records on demand. Whatever odd
// input gets stored while these tests attack the routes stays inside it and is dropped after.
import { randomUUID } from 'node:crypto';
import { hash } from '@node-rs/argon2';
import type { Role } from '../../../src/db/schema/companies';
import { baseUrl } from '../../support/browser';
import { query } from '../../support/db';
import { signIn } from '../../support/session';

const roles = ['admin', 'operator', 'engineer', 'householder'] as const satisfies readonly Role[];

export interface Playground {
  companyId: string;
  cookies: Record<Role, string>;
  homeId: string;
  tankId: string;
  alertId: string;
}

const password = 'hardening-test-password';

async function member(
  companyId: string,
  tag: string,
  role: Role,
  label: string,
): Promise<{ id: string; email: string }> {
  const email = `${label}-${tag}-${randomUUID().slice(0, 6)}@hardening.example.com`;
  const [u] = await query<{ id: string }>(
    `insert into "user" (id, email, name, password_hash, "emailVerified") values ($1, $2, $3, $4, now()) returning id`,
    [randomUUID(), email, `Test ${role}`, await hash(password)],
  );
  await query('insert into memberships (user_id, company_id, role) values ($1, $2, $3)', [u!.id, companyId, role]);
  return { id: u!.id, email };
}

export async function playground(): Promise<Playground> {
  const tag = randomUUID().slice(0, 8);
  const [c] = await query<{ id: string }>(
    `insert into companies (slug, name, email_domain) values ($1, $2, 'hardening.example.com') returning id`,
    [`hardening-${tag}`, `Hardening Test Heating ${tag}`],
  );
  const companyId = c!.id;
  const [home] = await query<{ id: string }>(
    `insert into homes (company_id, reference, address_line, town, postcode, occupants)
    values ($1, $2, '3 Quarry Lane', 'Tarnfield', 'WM9 4ZZ', 2) returning id`,
    [companyId, `HT-${tag}`],
  );
  const tankId = await spareTank(companyId, home!.id);
  const [alert] = await query<{ id: string }>(
    `insert into alerts (company_id, tank_id, kind, severity, evidence, opened_at)
    values ($1, $2, 'offline', 'warning', '{"summary":"No reading for 2 hours."}', now()) returning id`,
    [companyId, tankId],
  );
  const cookies = {} as Record<Role, string>;
  for (const role of roles) {
    const m = await member(companyId, tag, role, role);
    if (role === 'householder')
      await query('insert into home_members (home_id, user_id) values ($1, $2)', [home!.id, m.id]);
    cookies[role] = await signIn(baseUrl(), m.email, password);
  }
  return { companyId, cookies, homeId: home!.id, tankId, alertId: alert!.id };
}

/** A fresh tank in the home, for routes that change the tank they are given. */
export async function spareTank(companyId: string, homeId: string): Promise<string> {
  const [t] = await query<{ id: string }>(
    `insert into tanks (company_id, home_id, serial, model, volume_l, height_m, sensor_count, heat_source)
    values ($1, $2, $3, 'C210 cylinder', 210, 1.4, 8, 'hp_plate') returning id`,
    [companyId, homeId, `HT${randomUUID().slice(0, 10).toUpperCase()}`],
  );
  return t!.id;
}

/** A fresh commissioning draft of the company. */
export async function draft(companyId: string): Promise<string> {
  const [row] = await query<{ id: string }>('insert into commissionings (company_id) values ($1) returning id', [
    companyId,
  ]);
  return row!.id;
}

/** A fresh engineer of the company, for routes that change or remove a member. */
export async function spareMember(companyId: string): Promise<string> {
  return (await member(companyId, 'spare', 'engineer', 'member')).id;
}

/** A fresh pending invitation of the company. */
export async function invitation(companyId: string): Promise<string> {
  const [i] = await query<{ id: string }>(
    `insert into invitations (company_id, email, role, token_hash, expires_at)
    values ($1, $2, 'engineer', $3, now() + interval '1 day') returning id`,
    [companyId, `invited-${randomUUID()}@hardening.example.com`, randomUUID()],
  );
  return i!.id;
}

/** Removes the company with everything in it. */
export async function dropPlayground(p: Playground): Promise<void> {
  await query('delete from readings where tank_id in (select id from tanks where company_id = $1)', [p.companyId]);
  await query('delete from tanks where company_id = $1', [p.companyId]);
  await query('delete from "user" where id in (select user_id from memberships where company_id = $1)', [p.companyId]);
  await query('delete from companies where id = $1', [p.companyId]);
}
