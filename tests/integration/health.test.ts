import { describe, expect, it } from 'vitest';
import pg from 'pg';
import { baseUrl } from '../support/browser';
import { demoAccounts, demoTanks } from '../../src/lib/demo/scenario';

describe('GET /api/health', () => {
  it('reports the real database up, and nothing about its software', async () => {
    const res = await fetch(`${baseUrl()}/api/health`);
    expect(res.status).toBe(200);
    const text = await res.text();
    const body = JSON.parse(text);
    expect(body.status).toBe('ok');
    expect(body.database.up).toBe(true);
    // Public and unauthenticated: it must not tell a visitor which PostgreSQL (or anything else) runs here.
    expect(Object.keys(body.database).sort()).toEqual(['latencyMs', 'up']);
    const client = new pg.Client({ connectionString: process.env.DATABASE_URL });
    await client.connect();
    const { rows } = await client.query(`select current_setting('server_version') as v`);
    await client.end();
    expect(text).not.toContain(rows[0].v);
    expect(text).not.toMatch(/postgres|version/i);
    expect(res.headers.get('server')).toBeNull();
    expect(res.headers.get('x-powered-by')).toBeNull();
  });

  it('answers 404 with our own page for an unknown address', async () => {
    const res = await fetch(`${baseUrl()}/no-such-page`);
    expect(res.status).toBe(404);
    expect(await res.text()).toContain('There is nothing at this address.');
  });
});

describe('migrations and demo seed', () => {
  it('created the core tables and seeded both demo companies', async () => {
    const client = new pg.Client({ connectionString: process.env.DATABASE_URL });
    await client.connect();
    try {
      // Other tests add companies and tanks of their own; count only the scenario's serials.
      const serials = demoTanks()
        .filter((t) => t.companySlug === 'kestrel-vale')
        .map((t) => t.serial);
      const { rows } = await client.query(
        `select c.slug, count(t.id)::int as tanks from companies c left join tanks t on t.company_id = c.id and t.serial = any($1)
          where c.slug in ('kestrel-vale', 'orrin-bay') group by c.slug order by c.slug`,
        [serials],
      );
      expect(rows.map((r) => r.slug)).toEqual(['kestrel-vale', 'orrin-bay']);
      expect(rows.find((r) => r.slug === 'kestrel-vale').tanks).toBe(240);
      // One demo sign-in per role in each company, each with its role (other tests add people of their own).
      const accounts = await client.query(
        `select u.email, m.role from "user" u join memberships m on m.user_id = u.id where u.email = any($1) order by u.email`,
        [demoAccounts().map((a) => a.email)],
      );
      expect(accounts.rows).toEqual(
        demoAccounts()
          .map((a) => ({ email: a.email, role: a.role }))
          .sort((a, b) => a.email.localeCompare(b.email)),
      );
    } finally {
      await client.end();
    }
  });
});
