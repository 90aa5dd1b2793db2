// One size limit on every JSON body, bounded text fields, and nothing stored from a refused request.
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { MAX_JSON_BODY_BYTES } from '../../../src/lib/server/body';
import { baseUrl } from '../../support/browser';
import { closeTestDb, query } from '../../support/db';
import { draft, dropPlayground, playground, spareMember, spareTank, type Playground } from './fixtures';

let p: Playground;
beforeAll(async () => {
  p = await playground();
});
afterAll(async () => {
  await dropPlayground(p);
  await closeTestDb();
});

type Who = 'admin' | 'engineer' | 'householder' | null;
/** Every route that reads a JSON body: who calls it here and the path, with real ids of the playground. */
const jsonRoutes: { pattern: string; method: string; who: Who; path: () => Promise<string> }[] = [
  { pattern: '/api/alerts/[id]', method: 'PATCH', who: 'engineer', path: async () => `/api/alerts/${p.alertId}` },
  { pattern: '/api/alerts/acknowledge', method: 'POST', who: 'engineer', path: async () => '/api/alerts/acknowledge' },
  {
    pattern: '/api/alerts/preferences',
    method: 'PUT',
    who: 'householder',
    path: async () => '/api/alerts/preferences',
  },
  { pattern: '/api/alerts/thresholds', method: 'PUT', who: 'admin', path: async () => '/api/alerts/thresholds' },
  {
    pattern: '/api/commissioning/[id]',
    method: 'PATCH',
    who: 'engineer',
    path: async () => `/api/commissioning/${await draft(p.companyId)}`,
  },
  {
    pattern: '/api/commissioning/[id]/amendments',
    method: 'POST',
    who: 'engineer',
    path: async () => `/api/commissioning/${await draft(p.companyId)}/amendments`,
  },
  {
    pattern: '/api/commissioning/heat-pump-models',
    method: 'POST',
    who: 'admin',
    path: async () => '/api/commissioning/heat-pump-models',
  },
  { pattern: '/api/homes/[id]', method: 'PATCH', who: 'admin', path: async () => `/api/homes/${p.homeId}` },
  {
    pattern: '/api/homes/[id]/invitations',
    method: 'POST',
    who: 'engineer',
    path: async () => `/api/homes/${p.homeId}/invitations`,
  },
  { pattern: '/api/invitations', method: 'POST', who: 'admin', path: async () => '/api/invitations' },
  { pattern: '/api/invitations/accept', method: 'POST', who: null, path: async () => '/api/invitations/accept' },
  {
    pattern: '/api/members/[id]',
    method: 'PATCH',
    who: 'admin',
    path: async () => `/api/members/${await spareMember(p.companyId)}`,
  },
  { pattern: '/api/password-resets', method: 'POST', who: null, path: async () => '/api/password-resets' },
  {
    pattern: '/api/password-resets/complete',
    method: 'POST',
    who: null,
    path: async () => '/api/password-resets/complete',
  },
  {
    pattern: '/api/tanks/[id]/commands',
    method: 'POST',
    who: 'householder',
    path: async () => `/api/tanks/${p.tankId}/commands`,
  },
  {
    pattern: '/api/tanks/[id]/plan',
    method: 'POST',
    who: 'householder',
    path: async () => `/api/tanks/${p.tankId}/plan`,
  },
  {
    pattern: '/api/tanks/[id]/plan/send',
    method: 'POST',
    who: 'engineer',
    path: async () => `/api/tanks/${await spareTank(p.companyId, p.homeId)}/plan/send`,
  },
  { pattern: '/api/tariffs', method: 'POST', who: 'admin', path: async () => '/api/tariffs' },
  { pattern: '/api/visits', method: 'POST', who: 'engineer', path: async () => '/api/visits' },
];

function send(method: string, path: string, who: Who, body: BodyInit, headers: Record<string, string> = {}) {
  return fetch(`${baseUrl()}${path}`, {
    method,
    body,
    duplex: 'half',
    // An invented client address (TEST-NET-2, RFC 5737): the anonymous routes' throttles count it, not 127.0.0.1.
    headers: {
      origin: baseUrl(),
      'content-type': 'application/json',
      'x-forwarded-for': '198.51.100.61',
      ...(who ? { cookie: p.cookies[who] } : {}),
      ...headers,
    },
  } as RequestInit);
}

/** A JSON object of about `bytes` bytes. */
const padded = (bytes: number, extra: Record<string, unknown> = {}) =>
  JSON.stringify({ ...extra, pad: 'x'.repeat(bytes) });

const draftData = async (id: string) =>
  (
    await query<{ data: Record<string, unknown>; step: string }>(
      'select data, step from commissionings where id = $1',
      [id],
    )
  )[0];

describe('one size limit on JSON bodies', () => {
  it('lists every route that reads a JSON body', () => {
    const apiDir = new URL('../../../src/pages/api', import.meta.url).pathname;
    const walk = (dir: string): string[] =>
      readdirSync(dir).flatMap((n) => (statSync(join(dir, n)).isDirectory() ? walk(join(dir, n)) : [join(dir, n)]));
    const readers = walk(apiDir)
      .filter((f) => /\b(jsonBody|readJson)\(/.test(readFileSync(f, 'utf8')))
      .map((f) =>
        `/api/${relative(apiDir, f)
          .replace(/\.ts$/, '')
          .replace(/(^|\/)index$/, '')}`.replace(/\/$/, ''),
      );
    expect(readers.filter((r) => !jsonRoutes.some((j) => j.pattern === r))).toEqual([]);
  });

  for (const r of jsonRoutes) {
    it(`${r.method} ${r.pattern} refuses a body over ${MAX_JSON_BODY_BYTES / 1024} KiB with 413 naming the limit`, async () => {
      const res = await send(r.method, await r.path(), r.who, padded(MAX_JSON_BODY_BYTES + 1024));
      expect(res.status).toBe(413);
      const { error } = await res.json();
      expect(error).toMatchObject({ code: 'BodyTooLarge', fields: [{ field: '(body)', message: 'At most 256 KiB.' }] });
      expect(error.message).toBe('The request body is larger than the 256 KiB a JSON request may hold.');
    });
  }

  it('refuses an 8 MB commissioning field and keeps the draft as it was', async () => {
    const id = await draft(p.companyId);
    const ok = await send(
      'PATCH',
      `/api/commissioning/${id}`,
      'engineer',
      JSON.stringify({
        step: 'controls',
        values: { externalControl: 'none', controlNotes: 'Wired to the programmer.' },
      }),
    );
    expect(ok.status).toBe(200);
    const before = await draftData(id);

    const huge = await send(
      'PATCH',
      `/api/commissioning/${id}`,
      'engineer',
      JSON.stringify({
        step: 'controls',
        values: { externalControl: 'both', controlNotes: 'A'.repeat(8 * 1024 * 1024) },
      }),
    );
    expect(huge.status).toBe(413);
    expect(await draftData(id)).toEqual(before);
  });

  it('counts the bytes of a streamed body that declares no length', async () => {
    const id = await draft(p.companyId);
    const chunk = new TextEncoder().encode('x'.repeat(64 * 1024));
    let sent = 0;
    const stream = new ReadableStream<Uint8Array>({
      start(c) {
        c.enqueue(new TextEncoder().encode('{"step":"controls","values":{"externalControl":"none","controlNotes":"'));
      },
      pull(c) {
        if (sent++ < 128) c.enqueue(chunk);
        else {
          c.enqueue(new TextEncoder().encode('"}}'));
          c.close();
        }
      },
    });
    const res = await send('PATCH', `/api/commissioning/${id}`, 'engineer', stream);
    expect(res.headers.get('content-type')).toMatch(/json/);
    expect(res.status).toBe(413);
    expect((await draftData(id)).data).toEqual({});
  });

  it('reads a body just under the limit', async () => {
    const res = await send(
      'PUT',
      '/api/alerts/preferences',
      'householder',
      padded(MAX_JSON_BODY_BYTES - 200, { householderNotices: true }),
    );
    // Under the limit the body is read and validated: the unknown field is not a size problem.
    expect(res.status).not.toBe(413);
    expect(res.status).toBeLessThan(500);
  });
});

describe('text fields are bounded, with the field named', () => {
  it('refuses commissioning notes over their limit and stores nothing of the step', async () => {
    const id = await draft(p.companyId);
    const res = await send(
      'PATCH',
      `/api/commissioning/${id}`,
      'engineer',
      JSON.stringify({ step: 'controls', values: { externalControl: 'none', controlNotes: 'n'.repeat(301) } }),
    );
    expect(res.status).toBe(422);
    expect((await res.json()).error.fields).toEqual([
      { field: 'controls.controlNotes', message: 'At most 300 characters.' },
    ]);
    expect((await draftData(id)).data).toEqual({});
  });

  it('keeps nothing sent to the steps that hold no answers', async () => {
    const id = await draft(p.companyId);
    for (const step of ['connection', 'photos']) {
      const res = await send(
        'PATCH',
        `/api/commissioning/${id}`,
        'engineer',
        JSON.stringify({ step, values: { note: 'y'.repeat(200_000) } }),
      );
      expect(res.status).toBe(200);
    }
    expect((await draftData(id)).data).toEqual({ connection: {}, photos: {} });
  });

  it('refuses an over-long assignee and time-zone name, naming each', async () => {
    const assign = await send(
      'PATCH',
      `/api/alerts/${p.alertId}`,
      'engineer',
      JSON.stringify({ action: 'assign', assigneeId: 'u'.repeat(5000) }),
    );
    expect(assign.status).toBe(400);
    expect((await assign.json()).error.fields).toEqual([
      { field: 'assigneeId', message: 'assigneeId must name a person.' },
    ]);

    const tariff = await send(
      'POST',
      '/api/tariffs',
      'admin',
      JSON.stringify({
        homeId: p.homeId,
        tariff: {
          kind: 'day_night',
          unit: 'p/kWh',
          validFrom: '2026-01-01T00:00:00Z',
          timeZone: 'Europe/'.padEnd(5000, 'x'),
          nightStart: '00:30',
          nightEnd: '05:30',
          dayImport: 30,
          nightImport: 9,
        },
      }),
    );
    expect(tariff.status).toBe(422);
    expect((await tariff.json()).error.fields).toContainEqual(expect.objectContaining({ field: 'tariff.timeZone' }));
    expect(await query('select id from tariffs where home_id = $1', [p.homeId])).toEqual([]);
  });
});
