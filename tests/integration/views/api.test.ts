import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createAccount } from '../../support/accounts';
import { closeTestDb, query } from '../../support/db';
import { columnFigures } from '../../../src/lib/views/layers';
import { eventually } from '../../support/eventually';
import { signIn, signInAs } from '../../support/session';
import { createFixture, dropFixture, healthyLayersCc, LEAK_EVIDENCE_AGO_MS, type Fixture } from './fixtures';

const base = () => process.env.TEST_BASE_URL!;
let fx: Fixture;
/** The faulty tank's stored figures (sensor 2 missing), put back after the sort test changes them. */
const faultyFigures = columnFigures([15, null, 48, 55], { volumeL: 210, heightM: 1.4, targetC: 55, sensorCount: 4 })!;
const cookies: Record<string, string> = {};

async function get(path: string, who: keyof typeof cookies | null): Promise<Response> {
  return fetch(`${base()}${path}`, { headers: who ? { cookie: cookies[who]! } : {} });
}
async function getJson<T = any>(path: string, who: string): Promise<T> {
  const res = await get(path, who);
  expect(res.status, `${path} as ${who}: ${res.status}`).toBe(200);
  return res.json() as Promise<T>;
}

beforeAll(async () => {
  fx = await createFixture();
  const own = await createAccount({
    company: 'kestrel-vale',
    role: 'householder',
    homeId: fx.healthy.homeId,
    label: 'views-home',
  });
  [cookies.operator, cookies.engineer, cookies.householder, cookies.ownHouseholder, cookies.otherOperator] =
    await Promise.all([
      signInAs(base(), 'operator'),
      signInAs(base(), 'engineer'),
      signInAs(base(), 'householder'),
      signIn(base(), own.email, own.password),
      signInAs(base(), 'operator', 'orrin-bay'),
    ]);
}, 120_000);
afterAll(async () => {
  if (fx) await dropFixture(fx);
  await closeTestDb();
});

describe('GET /api/tanks', () => {
  it('lists the company tanks with latest state, filtered by free text', async () => {
    const body = await getJson(`/api/tanks?q=${fx.prefix}&sort=serial`, 'operator');
    expect(body).toMatchObject({ total: 5, page: 1, pageSize: 25 });
    expect(body.items.map((i: any) => i.serial)).toEqual(['A', 'B', 'C', 'D', 'E'].map((n) => `${fx.prefix}-${n}`));
    const a = body.items[0];
    expect(a).toMatchObject({
      id: fx.healthy.id,
      model: 'C210 cylinder',
      volumeL: 210,
      heatSource: 'hp_plate',
      status: 'ok',
      attention: [],
      topC: 55,
    });
    expect(a.home).toMatchObject({ town: 'Tarnfield', reference: `${fx.prefix}-H-A` });
  });
  it('filters by problem, status, town and heat source', async () => {
    const serials = async (qs: string) =>
      (await getJson(`/api/tanks?q=${fx.prefix}&sort=serial&${qs}`, 'operator')).items
        .map((i: any) => i.serial.slice(-1))
        .join('');
    expect(await serials('alert=sensor_fault')).toBe('B');
    expect(await serials('alert=short_cycling')).toBe('D');
    expect(await serials('status=offline')).toBe('C');
    expect(await serials('status=ok')).toBe('A');
    expect(await serials('status=attention')).toBe('BDE');
    expect(await serials('alert=heat_loss')).toBe('E');
    expect(await serials('town=Larkholt')).toBe('C');
    expect(await serials('heatSource=immersion_only')).toBe('C');
  });
  it('sorts and pages on the server', async () => {
    const p2 = await getJson(`/api/tanks?q=${fx.prefix}&sort=serial&dir=desc&pageSize=2&page=2`, 'operator');
    expect(p2).toMatchObject({ total: 5, page: 2, pageSize: 2 });
    expect(p2.items.map((i: any) => i.serial.slice(-1))).toEqual(['C', 'B']);
    const ranked = await getJson(`/api/tanks?q=${fx.prefix}`, 'operator');
    // Most urgent first: offline, the sensor fault, short-cycling, heat loss, then the healthy one.
    expect(ranked.items.map((i: any) => i.serial.slice(-1))).toEqual(['C', 'B', 'D', 'E', 'A']);
    const reversed = await getJson(`/api/tanks?q=${fx.prefix}&dir=desc`, 'operator');
    expect(reversed.items.map((i: any) => i.serial.slice(-1))).toEqual(['A', 'E', 'D', 'B', 'C']);
    const past = await getJson(`/api/tanks?q=${fx.prefix}&page=9`, 'operator');
    expect(past).toMatchObject({ items: [], total: 5 });
  });
  it('pages the ranked list across its two parts (tanks with open alerts, then the rest) without a gap or a repeat', async () => {
    const pages = await Promise.all(
      [1, 2, 3].map((p) => getJson(`/api/tanks?q=${fx.prefix}&pageSize=2&page=${p}`, 'operator')),
    );
    expect(pages.map((p) => p.items.map((i: any) => i.serial.slice(-1)).join(''))).toEqual(['CB', 'DE', 'A']);
    expect(pages.map((p) => p.total)).toEqual([5, 5, 5]);
  });
  it('sorts by a latest-state figure with the tanks that have none last, in either direction', async () => {
    // V40 of the fixture columns (thermal core): the healthy tank's top two layers count. The faulty
    // tank's top sensor is made to fail here, so its figures are withheld (null), as the writer stores them.
    await query(
      `update tank_latest_state set layers_cc = '{1500,3000,4800,NULL}', soc = null, v40_l = null, figures_quality = $2 where tank_id = $1`,
      [
        fx.faulty.id,
        JSON.stringify({
          status: 'withheld',
          leftOut: [4],
          faults: [{ sensor: 4, fault: 'missing' }],
          reason: 'Withheld.',
        }),
      ],
    );
    const asc = await getJson(`/api/tanks?q=${fx.prefix}&sort=v40`, 'operator');
    const desc = await getJson(`/api/tanks?q=${fx.prefix}&sort=v40&dir=desc`, 'operator');
    const v40 = (b: any) => b.items.map((i: any) => i.v40L);
    const known = v40(asc).filter((v: number | null) => v !== null);
    expect(known).toEqual([...known].sort((a, b) => a - b));
    expect(v40(asc).at(-1)).toBeNull();
    expect(v40(desc).at(-1)).toBeNull();
    expect(v40(desc).slice(0, -1)).toEqual([...known].sort((a, b) => b - a));
    expect(asc.items.at(-1).serial).toBe(fx.faulty.serial);
    expect(asc.items.at(-1).quality.status).toBe('withheld');
    await query(
      `update tank_latest_state set layers_cc = '{1500,NULL,4800,5500}', soc = $2, v40_l = $3, figures_quality = $4 where tank_id = $1`,
      [fx.faulty.id, faultyFigures.soc, faultyFigures.v40L, JSON.stringify(faultyFigures.quality)],
    );
    // Equal figures fall back to the serial: C, D and E share a column.
    const same = asc.items
      .filter((i: any) => i.v40L === asc.items.find((x: any) => x.serial === fx.silent.serial).v40L)
      .map((i: any) => i.serial.slice(-1));
    expect(same).toEqual(expect.arrayContaining(['C', 'D', 'E']));
    expect(same).toEqual([...same].sort());
    const seen = await getJson(`/api/tanks?q=${fx.prefix}&sort=lastSeen&pageSize=2&page=3`, 'operator');
    // Newest first: A, B, D and E a minute ago (by serial), C two hours ago.
    expect(seen.items.map((i: any) => i.serial.slice(-1))).toEqual(['C']);
    expect(seen.total).toBe(5);
  });
  it('finds tanks by free text in the serial, the home reference and the address, whatever the case', async () => {
    const found = async (q: string) =>
      (await getJson(`/api/tanks?q=${encodeURIComponent(q)}&sort=serial`, 'operator')).items.map((i: any) => i.serial);
    expect(await found(`${fx.prefix.toLowerCase()}-h-c`)).toEqual([fx.silent.serial]);
    expect(await found(`${fx.prefix}-B`)).toEqual([fx.faulty.serial]);
    expect(await found(`E Test Row`)).toContain(fx.leaky.serial);
    // % and _ are plain characters, not wildcards; a match never spans two fields.
    expect(await found(`${fx.prefix}%`)).toEqual([]);
    expect(await found(`${fx.prefix}-_`)).toEqual([]);
    expect(await found(`${fx.prefix}-H-A A Test`)).toEqual([]);
  });
  it('refuses a bad query string naming the field', async () => {
    for (const [qs, field] of [
      ['pageSize=0', 'pageSize'],
      ['page=abc', 'page'],
      ['sort=colour', 'sort'],
      ['alert=gremlins', 'alert'],
      ['heatSource=coal', 'heatSource'],
    ]) {
      const res = await get(`/api/tanks?${qs}`, 'operator');
      expect(res.status, qs).toBe(400);
      const body = await res.json();
      expect(
        body.error.fields.map((f: any) => f.field),
        qs,
      ).toContain(field);
    }
  });
});

describe('GET /api/tanks/{id}', () => {
  it('gives the specification, latest layers and figures from the thermal core', async () => {
    const t = await getJson(`/api/tanks/${fx.healthy.id}`, 'engineer');
    const minute = new Date(fx.now.getTime() - 60_000).getUTCMinutes();
    expect(t.latest.layersC).toEqual(healthyLayersCc(minute).map((c) => c / 100));
    // V40 (EN 16147, cold 10 °C): layers of 52.5 L; 55 °C → 52.5·45/30 = 78.75 L, 48 °C → 52.5·38/30 = 66.5 L; 30-ish °C stops the count.
    expect(t.figures.v40L).toBeCloseTo(78.75 + 66.5, 6);
    expect(t.commissioning).toMatchObject({ declaredLossW: 57, targetC: 55, sensorCount: 4 });
    expect(t.status).toBe('ok');
    expect(t.analysis.legionella.readings).toBe(2880);
  });
  it('explains what is wrong with a faulty tank from its open alert and estimates the sensor left out', async () => {
    const t = await getJson(`/api/tanks/${fx.faulty.id}`, 'operator');
    expect(t.attention.map((a: any) => a.kind)).toEqual(['sensor_fault']);
    expect(t.attention[0].detail).toMatch(/^Sensor 2 \(from the bottom\) gives no reading since /);
    // Sensor 2 left out and estimated by height between 15 and 48 °C: 31.5 °C (linear, common practice), below 40 °C,
    // so V40 counts the top two layers as the healthy column does: 78.75 + 66.5 L (EN 16147, cold 10 °C).
    expect(t.figures.quality).toMatchObject({
      status: 'estimated',
      leftOut: [2],
      reason: 'Estimated, sensor 2 left out (no reading).',
    });
    expect(t.figures.layersC[1]).toBeCloseTo(31.5, 9);
    expect(t.figures.v40L).toBeCloseTo(78.75 + 66.5, 6);
    const listed = await getJson(`/api/tanks?q=${fx.prefix}-B`, 'operator');
    // The list's figures are the writer's, stored as real (float4): equal to that precision.
    expect(listed.items[0]).toMatchObject({ quality: { status: 'estimated', leftOut: [2] } });
    expect(listed.items[0].v40L).toBeCloseTo(t.figures.v40L, 3);
    expect(listed.items[0].soc).toBeCloseTo(t.figures.soc, 5);
  });
});

describe('the fleet list, the tank page and the alert inbox agree', () => {
  it('shows a heat-loss alert in the list, its filter and the triage queue counts, and on the tank page', async () => {
    const list = await getJson(`/api/tanks?q=${fx.prefix}&alert=heat_loss`, 'operator');
    expect(list.items).toEqual([
      expect.objectContaining({ id: fx.leaky.id, status: 'attention', attention: ['heat_loss'] }),
    ]);
    // The summary is kept for about 10 s (src/db/queries/fleet.ts): an earlier test may have read it.
    await eventually(
      () => getJson('/api/fleet/summary', 'operator'),
      (s) => s.byAttention.heat_loss >= 1,
      20_000,
      'the heat-loss alert in the fleet summary',
    );
    const t = await getJson(`/api/tanks/${fx.leaky.id}`, 'engineer');
    expect(t.status).toBe('attention');
    expect(t.attention).toEqual([
      expect.objectContaining({
        kind: 'heat_loss',
        label: 'Heat loss above declared',
        severity: 'info',
        state: 'open',
        detail: expect.stringMatching(/^Cooling curves give a standing loss of 92 W and 95 W at 45 K/),
        at: fx.now.getTime() - LEAK_EVIDENCE_AGO_MS,
      }),
    ]);
    const inbox = await getJson(`/api/alerts?tankId=${fx.leaky.id}`, 'operator');
    expect(inbox.items.map((a: any) => a.id)).toEqual([t.attention[0].alertId]);
  });
  it('keeps an acknowledged alert and drops a resolved one, at once, in both', async () => {
    const [open] = (await getJson(`/api/tanks/${fx.cycling.id}`, 'operator')).attention;
    const act = (path: string, method: string, body: object) =>
      fetch(`${base()}${path}`, {
        method,
        headers: { cookie: cookies.operator!, 'content-type': 'application/json', origin: base() },
        body: JSON.stringify(body),
      });
    expect((await act('/api/alerts/acknowledge', 'POST', { ids: [open.alertId] })).status).toBe(200);
    expect((await getJson(`/api/tanks/${fx.cycling.id}`, 'operator')).attention[0]).toMatchObject({
      alertId: open.alertId,
      state: 'acknowledged',
    });
    expect((await getJson(`/api/tanks?q=${fx.prefix}&alert=short_cycling`, 'operator')).total).toBe(1);
    expect(
      (await act(`/api/alerts/${open.alertId}`, 'PATCH', { action: 'resolve', note: 'Checked on site (test).' }))
        .status,
    ).toBe(200);
    const after = await getJson(`/api/tanks/${fx.cycling.id}`, 'operator');
    expect(after).toMatchObject({ status: 'ok', attention: [] });
    expect((await getJson(`/api/tanks?q=${fx.prefix}&alert=short_cycling`, 'operator')).total).toBe(0);
    expect(
      (await getJson(`/api/tanks?q=${fx.prefix}&status=ok&sort=serial`, 'operator')).items.map((i: any) =>
        i.serial.slice(-1),
      ),
    ).toEqual(['A', 'D']);
  });
});

describe('GET /api/tanks/{id}/readings', () => {
  it('serves every raw reading in a 6-hour range with exact layer values', async () => {
    const to = fx.now.toISOString();
    const from = new Date(fx.now.getTime() - 6 * 3_600_000).toISOString();
    const s = await getJson(`/api/tanks/${fx.healthy.id}/readings?from=${from}&to=${to}`, 'engineer');
    expect(s.resolution).toBe('raw');
    expect(s.t).toHaveLength(360);
    expect(s.layers).toHaveLength(4);
    const i = s.t.findIndex((t: number) => new Date(t).getUTCMinutes() === 7);
    expect(s.layers.map((l: number[]) => l[i])).toEqual([15, 30.7, 48, 55]);
    expect(s.compressor[i]).toBe(1);
  });
  it('serves 15-minute rollups for 7 days and hourly ones for 30 days, or raw on request', async () => {
    const to = fx.now.toISOString();
    const week = await getJson(
      `/api/tanks/${fx.healthy.id}/readings?from=${new Date(fx.now.getTime() - 7 * 86_400_000).toISOString()}&to=${to}`,
      'engineer',
    );
    expect(week.resolution).toBe('15m');
    expect(week.t.length).toBeGreaterThanOrEqual(668);
    expect(week.t.length).toBeLessThanOrEqual(672);
    expect(week.layers[3][0]).toBe(61.5);
    expect(week.compressor[0]).toBeCloseTo(5 / 15, 9);
    const month = await getJson(
      `/api/tanks/${fx.healthy.id}/readings?from=${new Date(fx.now.getTime() - 30 * 86_400_000).toISOString()}&to=${to}`,
      'engineer',
    );
    expect(month.resolution).toBe('1h');
    expect(month.t.length).toBeGreaterThanOrEqual(190);
    expect(month.t.length).toBeLessThanOrEqual(193);
    const raw = await getJson(
      `/api/tanks/${fx.healthy.id}/readings?from=${new Date(fx.now.getTime() - 3 * 86_400_000).toISOString()}&to=${to}&resolution=raw`,
      'engineer',
    );
    expect(raw.t).toHaveLength(2880);
  });
  it('sends a poll only the points since its cursor, with the figures the whole range gives them', async () => {
    const to = fx.now.toISOString();
    const from = new Date(fx.now.getTime() - 6 * 3_600_000).toISOString();
    const full = await getJson(`/api/tanks/${fx.healthy.id}/readings?from=${from}&to=${to}`, 'engineer');
    const since = new Date(full.t[350]).toISOString();
    const poll = await getJson(
      `/api/tanks/${fx.healthy.id}/readings?from=${from}&to=${to}&resolution=raw&since=${since}`,
      'engineer',
    );
    expect(poll.t).toEqual(full.t.slice(350));
    expect(poll.layers).toEqual(full.layers.map((l: number[]) => l.slice(350)));
    expect([poll.soc, poll.v40L, poll.qualityAt]).toEqual([
      full.soc.slice(350),
      full.v40L.slice(350),
      full.qualityAt.slice(350),
    ]);
    const outside = await get(`/api/tanks/${fx.healthy.id}/readings?from=${from}&to=${to}&since=${to}`, 'engineer');
    expect(outside.status).toBe(400);
    expect((await outside.json()).error.fields[0].field).toBe('since');
  });
  it('refuses a range it cannot serve, naming the field', async () => {
    const r1 = await get(
      `/api/tanks/${fx.healthy.id}/readings?from=${new Date(fx.now.getTime() - 30 * 86_400_000).toISOString()}&resolution=raw`,
      'engineer',
    );
    expect(r1.status).toBe(400);
    expect((await r1.json()).error.fields[0].field).toBe('resolution');
    const r2 = await get(`/api/tanks/${fx.healthy.id}/readings?from=tuesday`, 'engineer');
    expect((await r2.json()).error.fields[0].field).toBe('from');
    const r3 = await get(`/api/tanks/${fx.healthy.id}/readings?resolution=5m`, 'engineer');
    expect((await r3.json()).error.fields[0].field).toBe('resolution');
  });
  it('exports the same range as CSV', async () => {
    const from = new Date(fx.now.getTime() - 3_600_000).toISOString();
    const res = await get(`/api/tanks/${fx.healthy.id}/export.csv?from=${from}&to=${fx.now.toISOString()}`, 'engineer');
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toMatch(/text\/csv/);
    const lines = (await res.text()).trim().split('\r\n');
    expect(lines[1]).toMatch(/^time_utc,layer_1_c,layer_2_c,layer_3_c,layer_4_c,/);
    expect(lines).toHaveLength(2 + 60);
  });
});

describe('GET /api/tanks/{id}/events', () => {
  it('lists runs and draws and marks the short-cycle start', async () => {
    const e = await getJson(`/api/tanks/${fx.cycling.id}/events`, 'engineer');
    expect(e.items.map((i: any) => [i.kind, i.shortCycle])).toEqual([
      ['compressor_run', false],
      ['compressor_run', true],
    ]);
    expect(e.shortCycleStarts).toBe(1);
    const d = await getJson(`/api/tanks/${fx.healthy.id}/events`, 'engineer');
    expect(d.items).toEqual([expect.objectContaining({ kind: 'draw', litres: 42.5 })]);
  });
});

describe('GET /api/fleet/summary', () => {
  it('counts the fleet and queues the tanks needing attention', async () => {
    // Kept for about 10 s: wait out a summary an earlier test read before this file's fixtures.
    const s = await eventually(
      () => getJson('/api/fleet/summary', 'operator'),
      (x) => x.byAttention.sensor_fault >= 1,
      20_000,
      'the fixtures in the fleet summary',
    );
    expect(s.tanks).toBeGreaterThanOrEqual(244);
    expect(s.socBins).toHaveLength(10);
    expect(s.queue.length).toBeGreaterThan(0);
    expect(s.queue[0].attention[0]).toBe('offline');
  });
});

describe('who may see what', () => {
  it('asks for sign-in, then checks role, then scope', async () => {
    for (const p of [
      '/api/tanks',
      `/api/tanks/${fx.healthy.id}`,
      `/api/tanks/${fx.healthy.id}/readings`,
      `/api/tanks/${fx.healthy.id}/events`,
      '/api/fleet/summary',
    ]) {
      expect((await get(p, null)).status, p).toBe(401);
    }
    expect((await get('/api/tanks', 'householder')).status).toBe(403);
    expect((await get(`/api/tanks/${fx.healthy.id}/events`, 'householder')).status).toBe(403);
    expect((await get('/api/fleet/summary', 'engineer')).status).toBe(403);
    expect((await get('/api/fleet/summary', 'householder')).status).toBe(403);
  });
  it('answers 404 for a tank of another home or another company', async () => {
    expect((await get(`/api/tanks/${fx.healthy.id}`, 'householder')).status).toBe(404);
    expect((await get(`/api/tanks/${fx.healthy.id}/readings`, 'householder')).status).toBe(404);
    expect((await get(`/api/tanks/${fx.healthy.id}`, 'otherOperator')).status).toBe(404);
    expect((await get(`/api/tanks/${fx.healthy.id}/events`, 'otherOperator')).status).toBe(404);
    expect((await get(`/api/tanks/not-a-uuid`, 'operator')).status).toBe(404);
    expect((await getJson(`/api/tanks?q=${fx.prefix}`, 'otherOperator')).total).toBe(0);
  });
  it('lets a householder read their own tank', async () => {
    const t = await getJson(`/api/tanks/${fx.healthy.id}`, 'ownHouseholder');
    expect(t.serial).toBe(fx.healthy.serial);
    const s = await getJson(`/api/tanks/${fx.healthy.id}/readings`, 'ownHouseholder');
    expect(s.t.length).toBeGreaterThan(0);
  });
});
