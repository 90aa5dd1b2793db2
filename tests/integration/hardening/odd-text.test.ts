// NUL bytes and other control characters in query strings, path ids and JSON fields: a 400 naming
// the field (or 404 for an id that names nothing), never a 500, and nothing stored.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { baseUrl } from '../../support/browser';
import { closeTestDb, query } from '../../support/db';
import { draft, dropPlayground, playground, spareMember, type Playground } from './fixtures';

let p: Playground;
beforeAll(async () => {
  p = await playground();
});
afterAll(async () => {
  await dropPlayground(p);
  await closeTestDb();
});

const call = (method: string, path: string, cookie: string, body?: string) =>
  fetch(`${baseUrl()}${path}`, {
    method,
    redirect: 'manual',
    headers: { origin: baseUrl(), cookie, ...(body !== undefined ? { 'content-type': 'application/json' } : {}) },
    ...(body !== undefined ? { body } : {}),
  });

describe('control characters in query strings', () => {
  for (const [path, field] of [
    ['/api/tanks?q=%00', 'q'],
    ['/api/tanks?town=%00', 'town'],
    ['/api/tanks?q=boiler%01room', 'q'],
    ['/api/alerts?town=%00', 'town'],
    ['/api/alerts?assignee=%00', 'assignee'],
    ['/api/audit?limit=5%00', 'limit'],
  ] as const) {
    it(`GET ${path} answers 400 naming ${field}`, async () => {
      const res = await call('GET', path, p.cookies.admin);
      expect(res.status).toBe(400);
      const { error } = await res.json();
      expect(error.fields).toEqual([
        {
          field,
          message: expect.stringMatching(/^must not contain control characters \(U\+000[01] at character \d+\)\.$/),
        },
      ]);
    });
  }

  it('still finds what a search with tabs or accents asks for', async () => {
    const res = await call('GET', '/api/tanks?q=Tarnfield%09', p.cookies.admin);
    expect(res.status).toBe(200);
    expect((await res.json()).total).toBe(1);
  });

  it('pages back through the audit log only by a whole entry id', async () => {
    for (const before of ['1.5', '99999999999999999999', '%00', '-3']) {
      expect((await call('GET', `/admin/audit?before=${before}`, p.cookies.admin)).status).toBe(200);
      expect((await call('GET', `/api/audit?before=${before}`, p.cookies.admin)).status).toBe(400);
    }
  });
});

describe('control characters in path ids', () => {
  it('PATCH and DELETE /api/members/%00 answer 404 and change no one', async () => {
    const member = await spareMember(p.companyId);
    for (const method of ['PATCH', 'DELETE']) {
      const res = await call(
        method,
        '/api/members/%00',
        p.cookies.admin,
        method === 'PATCH' ? JSON.stringify({ role: 'operator' }) : undefined,
      );
      expect(res.status).toBe(404);
    }
    expect((await query<{ role: string }>('select role from memberships where user_id = $1', [member]))[0]?.role).toBe(
      'engineer',
    );
  });

  it('ids with control characters name nothing anywhere', async () => {
    for (const path of [
      `/api/tanks/${p.tankId}%00`,
      '/api/commissioning/%00',
      '/api/uploads/%01',
      '/api/alerts/%00',
      '/api/visits/%1F',
    ]) {
      expect((await call('GET', path, p.cookies.admin)).status, path).toBe(404);
    }
  });
});

describe('control characters in JSON fields', () => {
  it('refuses NUL in a commissioning field, naming it, and keeps the draft as it was', async () => {
    const id = await draft(p.companyId);
    const res = await call(
      'PATCH',
      `/api/commissioning/${id}`,
      p.cookies.engineer,
      JSON.stringify({ step: 'controls', values: { externalControl: 'none', controlNotes: 'Valve\u0000 checked' } }),
    );
    expect(res.status).toBe(400);
    expect((await res.json()).error).toMatchObject({
      code: 'InvalidText',
      fields: [
        { field: 'values.controlNotes', message: 'must not contain control characters (U+0000 at character 6).' },
      ],
    });
    expect((await query('select data from commissionings where id = $1', [id]))[0]!.data).toEqual({});
  });

  it('refuses half a surrogate pair (not storable as jsonb), and NUL in a field name or a list', async () => {
    const cases: [string, string, string][] = [
      [
        'PATCH',
        `/api/commissioning/${await draft(p.companyId)}`,
        '{"step":"controls","values":{"externalControl":"none","controlNotes":"\\ud83d"}}',
      ],
      [
        'PATCH',
        `/api/commissioning/${await draft(p.companyId)}`,
        '{"step":"controls","values":{"external\\u0000Control":"none"}}',
      ],
      ['POST', '/api/alerts/acknowledge', '{"ids":["\\u0000"],"note":"x"}'],
    ];
    const fields = [];
    for (const [method, path, body] of cases) {
      const res = await call(method, path, p.cookies.engineer, body);
      expect(res.status).toBe(400);
      fields.push((await res.json()).error.fields[0].field);
    }
    expect(fields).toEqual(['values.controlNotes', 'values', 'ids.0']);
  });

  it('keeps line breaks and tabs in notes', async () => {
    const id = await draft(p.companyId);
    const res = await call(
      'PATCH',
      `/api/commissioning/${id}`,
      p.cookies.engineer,
      JSON.stringify({
        step: 'controls',
        values: { externalControl: 'none', controlNotes: 'Line one\r\n\tLine two – ✓' },
      }),
    );
    expect(res.status).toBe(200);
    expect((await res.json()).data.controls.controlNotes).toBe('Line one\r\n\tLine two – ✓');
  });
});
