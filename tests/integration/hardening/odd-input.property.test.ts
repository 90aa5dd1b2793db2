// Property: whatever odd text or number reaches any route (in its path, its query string or its
// JSON body's fields), the answer is never a 5xx. Every route in route-expectations.ts is called
// by a signed-in person allowed to use it, in a company of its own, with fast-check's generated
// input: control characters, NUL, broken UTF-16, huge and NaN-ish numbers, very long strings.
// Deterministic: a fixed seed, so a failure replays the same way.
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Role } from '../../../src/db/schema/companies';
import { baseUrl } from '../../support/browser';
import { closeTestDb } from '../../support/db';
import { routeExpectations, type Method, type MethodExpectation, type SampleKind } from '../auth/route-expectations';
import { draft, dropPlayground, invitation, playground, spareMember, spareTank, type Playground } from './fixtures';

const SEED = 20_260_301;
const RUNS = 25;

let p: Playground;
beforeAll(async () => {
  p = await playground();
});
afterAll(async () => {
  await dropPlayground(p);
  await closeTestDb();
});

// ---- odd input ----
const nasty = fc.constantFrom(
  '\u0000',
  'a\u0000b',
  '\u0001',
  '\u0008',
  '\u001b[31m',
  '\u007f',
  '\ud800',
  'x\udfff',
  '\u202e',
  '\uffff',
  'NaN',
  '-NaN',
  'Infinity',
  '-Infinity',
  '1e400',
  '-1e400',
  '1e-400',
  '9007199254740993',
  '99999999999999999999999',
  '-1',
  '-0',
  '0',
  '0.5',
  '0x1F',
  '1_000',
  '',
  ' ',
  'null',
  'undefined',
  'true',
  '[]',
  '{}',
  '%00',
  '%',
  '%%',
  "'; select pg_sleep(1); --",
  '../../etc/passwd',
  '<script>alert(1)</script>',
  'Zählerstand – 写真',
  '🔥'.repeat(50),
  '2026-02-30',
  '2026-01-01T00:00:00Z',
  '00000000-0000-4000-8000-000000000000',
  'admin',
);
const oddString: fc.Arbitrary<string> = fc.oneof(
  { weight: 4, arbitrary: nasty },
  { weight: 3, arbitrary: fc.string({ unit: 'binary', maxLength: 24 }) },
  { weight: 1, arbitrary: fc.integer({ min: 1_000, max: 30_000 }).map((n) => 'é'.repeat(n)) },
  { weight: 1, arbitrary: fc.double().map(String) },
  { weight: 1, arbitrary: fc.bigInt({ min: -(2n ** 80n), max: 2n ** 80n }).map(String) },
);
const oddNumber = fc.oneof(
  fc.constantFrom(1e308, -1e308, 5e-324, Number.MAX_SAFE_INTEGER + 2, -(2 ** 63), 2 ** 31, 2 ** 53, -1, 0, -0, 0.5),
  fc.double(), // NaN and ±Infinity travel as null in JSON
  fc.integer(),
);
const oddValue: fc.Arbitrary<unknown> = fc.oneof(
  { weight: 4, arbitrary: oddString },
  { weight: 3, arbitrary: oddNumber },
  { weight: 1, arbitrary: fc.constantFrom(null, true, false, [], {}) },
  { weight: 1, arbitrary: fc.array(oddString, { maxLength: 4 }) },
  { weight: 1, arbitrary: fc.dictionary(oddString, oddString, { maxKeys: 3 }) },
  { weight: 1, arbitrary: fc.constant(Array.from({ length: 5_000 }, (_, i) => i)) },
);

// ---- a plausible body per route, whose fields the property then spoils ----
const stepBodies = [
  {
    step: 'home',
    values: {
      addressLine: '3 Quarry Lane',
      town: 'Tarnfield',
      postcode: 'WM9 4ZZ',
      occupants: 2,
      contactName: 'Pat Example',
      contactEmail: 'pat@example.com',
      contactPhone: '0100 000000',
    },
  },
  {
    step: 'cylinder',
    values: {
      serial: 'HTFUZZ-0001',
      model: 'C210 cylinder',
      volumeL: 210,
      heightM: 1.4,
      sensorCount: 4,
      sensorHeightsM: '0.1, 0.5, 0.9, 1.3',
      exchanger: 'coil',
      immersionW: 3000,
      declaredLossW: 60,
    },
  },
  {
    step: 'heat_source',
    values: { heatSource: 'hp_coil', hpOutputW: 5000, ntcR25Ohm: 10000, ntcBetaK: 3977, callC: 45, satisfiedC: 50 },
  },
  { step: 'target', values: { targetC: 55, hysteresisK: 5, belowSixtyPlan: 'Weekly immersion cycle to 60 °C.' } },
  { step: 'controls', values: { externalControl: 'none', controlNotes: 'Wired to the programmer.' } },
  {
    step: 'safety',
    values: {
      expansion: true,
      reliefValve: true,
      discharge: true,
      reducingValve: true,
      isolation: true,
      competentPerson: true,
      registrationNumber: 'REG-1',
    },
  },
  { step: 'signoff', values: { householderEmail: 'pat@example.com', notes: 'All good.' } },
];
const flatTariff = { kind: 'flat', unit: 'p/kWh', validFrom: '2026-01-01T00:00:00Z', import: 25, export: 5 };
const dayNightTariff = {
  kind: 'day_night',
  unit: 'p/kWh',
  validFrom: '2026-01-01T00:00:00Z',
  timeZone: 'Europe/London',
  nightStart: '00:30',
  nightEnd: '05:30',
  dayImport: 30,
  nightImport: 9,
};

function bodiesFor(pattern: string, method: Method): unknown[] {
  const key = `${method} ${pattern}`;
  switch (key) {
    case 'PATCH /api/commissioning/[id]':
      return stepBodies;
    case 'POST /api/commissioning/[id]/amendments':
      return [
        { field: 'signoff.notes', value: 'Checked again.', reason: 'Typing error' },
        { field: 'target.targetC', value: 60, reason: 'Raised for legionella control' },
      ];
    case 'POST /api/commissioning/heat-pump-models':
      return [{ name: 'Fuzz HP 5', outputW: 5000, ntcR25Ohm: 10000, ntcBetaK: 3977 }];
    case 'PATCH /api/homes/[id]':
      return [{ coldInletC: 12 }, { coldInletC: null }];
    case 'POST /api/homes/[id]/invitations':
      return [{ email: 'fuzz-home@example.com', name: 'Pat Example' }];
    case 'POST /api/invitations':
      return [{ email: 'fuzz-staff@example.com', name: 'Sam Example', role: 'engineer' }];
    case 'POST /api/invitations/accept':
      return [{ token: 't'.repeat(40), name: 'Sam Example', password: 'a-long-enough-password' }];
    case 'POST /api/password-resets':
      return [{ email: 'nobody@hardening.example.com' }];
    case 'POST /api/password-resets/complete':
      return [{ token: 't'.repeat(40), password: 'a-long-enough-password' }];
    case 'PATCH /api/members/[id]':
      return [{ role: 'operator' }];
    case 'PATCH /api/alerts/[id]':
      return [
        { action: 'resolve', note: 'Fixed on site.' },
        { action: 'assign', assigneeId: null },
      ];
    case 'POST /api/alerts/acknowledge':
      return [{ ids: [p.alertId], note: 'Looking into it.' }];
    case 'PUT /api/alerts/thresholds':
      return [{ shortCycleMinGapMin: 60, severity: { offline: 'warning' } }];
    case 'PUT /api/alerts/preferences':
      return [{ householderNotices: true }];
    case 'POST /api/visits':
      return [
        {
          tankId: p.tankId,
          kind: 'annual_inspection',
          visitedAt: '2026-01-05',
          findings: 'Checked the relief valve.',
          parts: [{ name: 'Valve', quantity: 1 }],
          readings: { topC: 55, reliefValveTested: true },
          resolvedAlertIds: [],
          uploadIds: [],
        },
      ];
    case 'POST /api/tanks/[id]/commands':
      return [
        { kind: 'boost', minutes: 30 },
        { kind: 'set_target', targetC: 60, hysteresisK: 5 },
        { kind: 'set_schedule', windows: [{ from: '00:30', to: '04:30' }], comfortFloorL40: 65 },
      ];
    case 'POST /api/tanks/[id]/plan':
    case 'POST /api/tanks/[id]/plan/send':
      return [{ comfortFloorL40: 65, hours: 24 }];
    case 'POST /api/tariffs':
      return [
        { homeId: p.homeId, tariff: flatTariff },
        { homeId: null, tariff: dayNightTariff },
      ];
    case 'POST /api/ingest':
      return [{ ts: Date.now(), layersC: [50, 48, 40, 30] }];
    default:
      return [{}];
  }
}

type PathKey = (string | number)[];
/** Every place in a JSON value a spoilt value can go: each field and list item, at any depth. */
function places(value: unknown, at: PathKey = []): PathKey[] {
  if (Array.isArray(value)) return [at, ...value.flatMap((v, i) => places(v, [...at, i]))];
  if (value && typeof value === 'object')
    return [at, ...Object.entries(value).flatMap(([k, v]) => places(v, [...at, k]))];
  return [at];
}
function spoil(value: unknown, at: PathKey, odd: unknown, how: 'replace' | 'add' | 'remove'): unknown {
  if (at.length === 0) return how === 'replace' ? odd : value;
  const copy: any = structuredClone(value);
  let node = copy;
  for (const k of at.slice(0, -1)) node = node[k];
  const last = at[at.length - 1]!;
  if (how === 'remove' && !Array.isArray(node)) delete node[last];
  else if (how === 'add' && node[last] && typeof node[last] === 'object' && !Array.isArray(node[last]))
    node[last].unexpected = odd;
  else node[last] = odd;
  return copy;
}

// ---- percent-encoding that never throws (encodeURIComponent refuses half a surrogate pair) ----
const pct = (s: string) => [...Buffer.from(s, 'utf8')].map((b) => `%${b.toString(16).padStart(2, '0')}`).join('');

const queryNames = [
  'q',
  'status',
  'alert',
  'town',
  'heatSource',
  'sort',
  'dir',
  'page',
  'pageSize',
  'from',
  'to',
  'resolution',
  'kind',
  'severity',
  'state',
  'assignee',
  'tankId',
  'homeId',
  'before',
  'limit',
  'withinDays',
  'unit',
  'name',
  'negativeImportAllowed',
  'next',
  'token',
  'error',
  'signedOut',
];

// ---- who calls, and with which ids ----
function callerOf(e: MethodExpectation): Role | null {
  if (e.who === 'anyone' || e.who === 'device') return null;
  if (e.who === 'signedIn') return 'admin';
  return e.who.includes('admin') ? 'admin' : e.who[0]!;
}

async function sampleId(kind: SampleKind): Promise<string> {
  switch (kind) {
    case 'home':
      return p.homeId;
    case 'tank':
      return p.tankId;
    case 'spareTank':
      return spareTank(p.companyId, p.homeId);
    case 'member':
      return spareMember(p.companyId);
    case 'commissioning':
      return draft(p.companyId);
    case 'invitation':
      return invitation(p.companyId);
  }
}

const routes = Object.entries(routeExpectations).flatMap(([pattern, r]) =>
  (Object.entries(r.methods) as [Method, MethodExpectation][])
    // Ending the caller's sessions would sign the property's own people out.
    .filter(([, e]) => !e.endsSession)
    .map(([method, e]) => ({ pattern, method, e, params: r.params ?? {} })),
);

describe('no route answers 5xx to odd input', () => {
  it('covers every route the role matrix knows', () => {
    expect(routes.length).toBeGreaterThan(60);
  });

  for (const r of routes) {
    it(`${r.method} ${r.pattern}`, async () => {
      const role = callerOf(r.e);
      // Auth.js's POST (sign-in, sign-out) is exercised without a session, so it ends none.
      const cookie = role && !r.pattern.startsWith('/api/auth/') ? p.cookies[role] : undefined;
      const ids: Record<string, string> = {};
      for (const [name, kind] of Object.entries(r.params))
        ids[name] = typeof kind === 'string' ? await sampleId(kind) : kind.fixed;
      const hasBody = r.method !== 'GET' && r.method !== 'DELETE';
      const bodies = bodiesFor(r.pattern, r.method);
      const paramNames = Object.keys(ids);
      const modes = [
        ...(paramNames.length ? ['path' as const] : []),
        'query' as const,
        ...(hasBody ? ['body' as const, 'body' as const] : []),
      ];

      const input = fc.record({
        mode: fc.constantFrom(...modes),
        param: fc.constantFrom(...(paramNames.length ? paramNames : ['-'])),
        pathValue: oddString,
        query: fc.array(fc.tuple(fc.oneof(fc.constantFrom(...queryNames), oddString), oddString), {
          minLength: 1,
          maxLength: 3,
        }),
        body: fc.nat({ max: bodies.length - 1 }),
        place: fc.nat(),
        how: fc.constantFrom('replace' as const, 'replace' as const, 'add' as const, 'remove' as const),
        odd: oddValue,
      });

      const seen: string[] = [];
      await fc.assert(
        fc.asyncProperty(input, async (x) => {
          let path = r.pattern;
          for (const name of paramNames) {
            const value = x.mode === 'path' && x.param === name ? pct(x.pathValue) : ids[name]!;
            path = path.replace(new RegExp(`\\[(\\.\\.\\.)?${name}\\]`), value);
          }
          if (x.mode === 'query') path += `?${x.query.map(([k, v]) => `${pct(k)}=${pct(v)}`).join('&')}`;
          let body: string | undefined;
          if (hasBody) {
            const base = bodies[x.body];
            if (x.mode === 'body') {
              const all = places(base);
              body = JSON.stringify(spoil(base, all[x.place % all.length]!, x.odd, x.how)) ?? 'null';
            } else body = JSON.stringify(base);
          }
          const res = await fetch(`${baseUrl()}${path}`, {
            method: r.method,
            redirect: 'manual',
            // An invented client address (TEST-NET-2, RFC 5737), so that throttles count it and not 127.0.0.1.
            headers: {
              origin: baseUrl(),
              'x-forwarded-for': '198.51.100.62',
              ...(cookie ? { cookie } : {}),
              ...(body !== undefined ? { 'content-type': 'application/json' } : {}),
            },
            ...(body !== undefined ? { body } : {}),
          });
          await res.arrayBuffer();
          // Every 5xx of the runs is listed below, with the request that caused it.
          if (res.status >= 500)
            seen.push(`${res.status} ${r.method} ${path.slice(0, 300)} ${body?.slice(0, 300) ?? ''}`);
        }),
        { seed: SEED, numRuns: RUNS },
      );
      expect(seen).toEqual([]);
    }, 120_000);
  }
});
