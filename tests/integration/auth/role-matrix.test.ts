import { randomUUID } from 'node:crypto';
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Role } from '../../../src/db/schema/companies';
import { routeAccess } from '../../../src/lib/server/access';
import { createAccount, companyId, type TestAccount } from '../../support/accounts';
import { baseUrl } from '../../support/browser';
import { closeTestDb, query } from '../../support/db';
import { signIn, signInAs, type DemoCompanySlug } from '../../support/session';
import { routeExpectations, type Method, type MethodExpectation, type SampleKind } from './route-expectations';

afterAll(closeTestDb);

// ---- the routes, from the file system (as Astro names them: lower case, no extension) ----
const pagesDir = new URL('../../../src/pages', import.meta.url).pathname;
const methods: Method[] = ['GET', 'POST', 'PUT', 'PATCH', 'DELETE'];

interface RouteFile {
  pattern: string;
  file: string;
  methods: Method[];
}

function walk(dir: string): string[] {
  return readdirSync(dir)
    .filter((n) => !n.startsWith('_'))
    .flatMap((n) => {
      const p = join(dir, n);
      return statSync(p).isDirectory() ? walk(p) : [p];
    });
}

function routeFiles(): RouteFile[] {
  return walk(pagesDir)
    .filter((f) => /\.(astro|ts|js|md|mdx|html)$/.test(f))
    .map((file) => {
      const rel = relative(pagesDir, file)
        .replace(/\.(astro|ts|js|md|mdx|html)$/, '')
        .replace(/(^|\/)index$/, '');
      const source = readFileSync(file, 'utf8');
      const exported =
        file.endsWith('.ts') || file.endsWith('.js')
          ? methods.filter((m) => new RegExp(`export\\s+(const|async\\s+function|function)\\s+${m}\\b`).test(source))
          : ['GET' as const];
      return { pattern: `/${rel}`.toLowerCase(), file: relative(process.cwd(), file), methods: exported };
    });
}

// ---- who asks, and about what ----
type ViewerKey = 'anonymous' | Role;
const viewers: ViewerKey[] = ['anonymous', 'admin', 'operator', 'engineer', 'householder'];
type Target = 'ownHome' | 'otherHome' | 'otherCompany' | 'ownCompany';
const targetsOf: Record<SampleKind, Target[]> = {
  home: ['ownHome', 'otherHome', 'otherCompany'],
  tank: ['ownHome', 'otherHome', 'otherCompany'],
  spareTank: ['ownHome', 'otherHome', 'otherCompany'],
  invitation: ['ownCompany', 'otherCompany'],
  member: ['ownCompany', 'otherCompany'],
  commissioning: ['ownCompany', 'otherCompany'],
};

const cookies = new Map<ViewerKey, string>();
const homes: Record<'ownHome' | 'otherHome' | 'otherCompany', string> = {
  ownHome: '',
  otherHome: '',
  otherCompany: '',
};

beforeAll(async () => {
  for (const v of viewers) if (v !== 'anonymous') cookies.set(v, await signInAs(baseUrl(), v, 'kestrel-vale'));
  const [own] = await query<{ id: string }>(
    `select hm.home_id as id from home_members hm join "user" u on u.id = hm.user_id where u.email = 'householder@kestrelvale.example.com'`,
  );
  const [other] = await query<{ id: string }>(
    `select h.id from homes h join companies c on c.id = h.company_id where c.slug = 'kestrel-vale' and h.id <> $1 and h.reference ~ '^KV-[0-9]{4}$' order by h.reference limit 1`,
    [own.id],
  );
  const [foreign] = await query<{ id: string }>(
    `select h.id from homes h join companies c on c.id = h.company_id where c.slug = 'orrin-bay' and h.reference ~ '^OB-[0-9]{4}$' order by h.reference limit 1`,
  );
  Object.assign(homes, { ownHome: own.id, otherHome: other.id, otherCompany: foreign.id });
});

const companyOf = (t: Target): DemoCompanySlug => (t === 'otherCompany' ? 'orrin-bay' : 'kestrel-vale');

/** A sample id of a kind for a target; mutable kinds are made fresh for every request. */
async function sample(kind: SampleKind, target: Target): Promise<string> {
  switch (kind) {
    case 'home':
      return homes[target as keyof typeof homes];
    case 'tank': {
      const [t] = await query<{ id: string }>('select id from tanks where home_id = $1', [
        homes[target as keyof typeof homes],
      ]);
      return t.id;
    }
    case 'spareTank': {
      const home = homes[target as keyof typeof homes];
      const [t] = await query<{ id: string }>(
        `insert into tanks (company_id, home_id, serial, model, volume_l, height_m, sensor_count, heat_source)
        select company_id, id, $2, 'C210 cylinder', 210, 1.4, 12, 'hp_plate' from homes where id = $1 returning id`,
        [home, `MATRIX-${randomUUID().slice(0, 12)}`],
      );
      return t.id;
    }
    case 'member':
      return (
        (await createAccount({
          company: companyOf(target),
          role: 'engineer',
          password: null,
          label: 'matrix',
        })) as TestAccount
      ).id;
    case 'commissioning': {
      const [c] = await query<{ id: string }>('insert into commissionings (company_id) values ($1) returning id', [
        await companyId(companyOf(target)),
      ]);
      return c.id;
    }
    case 'invitation': {
      const [i] = await query<{ id: string }>(
        `insert into invitations (company_id, email, role, token_hash, expires_at)
        values ($1, $2, 'engineer', $3, now() + interval '1 day') returning id`,
        [await companyId(companyOf(target)), `matrix-${randomUUID()}@example.com`, randomUUID()],
      );
      return i.id;
    }
  }
}

/** A fresh session of a throwaway account in the role, for calls that end the caller's sessions. */
async function throwawaySession(v: ViewerKey): Promise<string | undefined> {
  if (v === 'anonymous') return undefined;
  const acct = await createAccount({
    company: 'kestrel-vale',
    role: v,
    homeId: v === 'householder' ? homes.ownHome : undefined,
    label: 'matrix-session',
  });
  return signIn(baseUrl(), acct.email, acct.password);
}

// ---- what the answer must be ----
type Outcome = 'in' | 'signIn' | 'forbidden' | 'notFound';

function expected(e: MethodExpectation, viewer: ViewerKey, target: Target | null): Outcome {
  if (e.who === 'anyone') return 'in';
  if (viewer === 'anonymous') return 'signIn';
  if (e.who !== 'signedIn' && e.who !== 'device' && !e.who.includes(viewer)) return 'forbidden';
  if (target && e.scope) {
    if (target === 'otherCompany') return 'notFound';
    if (e.scope === 'home' && viewer === 'householder' && target !== 'ownHome') return 'notFound';
  }
  return 'in';
}

function observed(res: Response, isApi: boolean, ok: readonly number[] | undefined): Outcome | `status ${number}` {
  const s = res.status;
  const location = res.headers.get('location') ?? '';
  if (ok?.includes(s)) return 'in';
  if (isApi) {
    if (s === 401) return 'signIn';
    if (s === 403) return 'forbidden';
    if (s === 404) return 'notFound';
    if ((s >= 200 && s < 300) || [400, 409, 410, 422].includes(s)) return 'in';
    return `status ${s}`;
  }
  if (s >= 300 && s < 400) return /\/signin\?next=/.test(location) ? 'signIn' : 'in';
  if (s === 200) return 'in';
  if (s === 404) return 'notFound';
  return `status ${s}`;
}

const files = routeFiles();

describe('route table', () => {
  it('lists every route file in src/lib/server/access.ts, with exactly the methods it exports', () => {
    const problems: string[] = [];
    for (const f of files) {
      const rule = routeAccess[f.pattern];
      if (!rule) {
        problems.push(
          `${f.file}: '${f.pattern}' is not in src/lib/server/access.ts (deny by default: it answers 404 to everyone)`,
        );
        continue;
      }
      const listed = Object.keys(rule).sort();
      if (listed.join() !== [...f.methods].sort().join())
        problems.push(`${f.file}: access.ts lists ${listed.join(', ')} but the file exports ${f.methods.join(', ')}`);
    }
    expect(problems).toEqual([]);
  });

  it('has a role-matrix expectation for every route file', () => {
    const missing = files
      .filter((f) => !routeExpectations[f.pattern])
      .map((f) => `${f.file}: add '${f.pattern}' to tests/integration/auth/route-expectations.ts`);
    const partial = files
      .filter((f) => routeExpectations[f.pattern])
      .filter((f) => Object.keys(routeExpectations[f.pattern].methods).sort().join() !== [...f.methods].sort().join())
      .map((f) => `${f.file}: the expectation for '${f.pattern}' must cover exactly ${f.methods.join(', ')}`);
    expect([...missing, ...partial]).toEqual([]);
  });
});

describe('role matrix: every route × every role × own/other company and home', () => {
  for (const f of files) {
    const exp = routeExpectations[f.pattern];
    if (!exp) continue;
    it(`${f.pattern} answers each role as expected`, async () => {
      const isApi = f.pattern.startsWith('/api/');
      const paramKinds = Object.entries(exp.params ?? {});
      const sampled = paramKinds.find(([, k]) => typeof k === 'string')?.[1] as SampleKind | undefined;
      const mismatches: string[] = [];
      for (const [method, e] of Object.entries(exp.methods) as [Method, MethodExpectation][]) {
        if (e.who === 'device') {
          // Device routes take a tank's bearer token; no person's session ever opens them.
          for (const v of viewers) {
            const res = await fetch(`${baseUrl()}${f.pattern}`, {
              method,
              headers: {
                origin: baseUrl(),
                'content-type': 'application/json',
                ...(cookies.get(v) ? { cookie: cookies.get(v)! } : {}),
              },
              body: '{}',
            });
            if (res.status < 400) mismatches.push(`${method} as ${v}: ${res.status}, a session opened a device route`);
          }
          continue;
        }
        for (const target of sampled ? targetsOf[sampled] : [null]) {
          for (const v of viewers) {
            let path = f.pattern;
            for (const [name, kind] of paramKinds) {
              const value = typeof kind === 'string' ? await sample(kind, target!) : kind.fixed;
              path = path.replace(new RegExp(`\\[(\\.\\.\\.)?${name}\\]`), value);
            }
            const headers: Record<string, string> = { origin: baseUrl() };
            const cookie = e.endsSession ? await throwawaySession(v) : cookies.get(v);
            if (cookie) headers.cookie = cookie;
            let body: string | undefined;
            if (method !== 'GET' && method !== 'DELETE') {
              headers['content-type'] = 'application/json';
              body = JSON.stringify(e.body ?? {});
            }
            const res = await fetch(`${baseUrl()}${path}`, { method, headers, body, redirect: 'manual' });
            const outcome = expected(e, v, target);
            // Pages never say "forbidden": a role that may not see a page gets the same 404 as a foreign id.
            const want = !isApi && outcome === 'forbidden' ? 'notFound' : outcome;
            const got = observed(res, isApi, e.ok);
            if (got !== want)
              mismatches.push(
                `${method} ${path} as ${v}${target ? ` (${target})` : ''}: expected ${want}, got ${got} (${res.status})`,
              );
          }
        }
      }
      // A method the route does not list is refused to everyone, even an admin.
      const unlisted = methods.find((m) => !exp.methods[m] && !routeAccess[f.pattern]?.[m]);
      if (isApi && unlisted && !paramKinds.length) {
        const res = await fetch(`${baseUrl()}${f.pattern}`, {
          method: unlisted,
          headers: { origin: baseUrl(), cookie: cookies.get('admin')! },
          redirect: 'manual',
        });
        if (res.status !== 404 && res.status !== 405)
          mismatches.push(`${unlisted} ${f.pattern} as admin: expected 404, got ${res.status}`);
      }
      expect(mismatches).toEqual([]);
    });
  }
});
