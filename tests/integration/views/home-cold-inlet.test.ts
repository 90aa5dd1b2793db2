// A home's cold-inlet temperature set through the API: its tanks' figures count from it at once
// (the list's stored figures and the tank page's agree), null goes back to EN 16147's 10 °C, bad
// values are refused naming the field with nothing changed, and only staff who may change a
// home can, in their own company.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { tankFigures } from '../../../src/lib/thermal';
import { closeTestDb, query } from '../../support/db';
import { call, dropCompany, ownCompany, staffOf } from '../energy/fixtures';

const LAYERS_C = [18, 30, 47, 55];
const geometry = { volumeL: 210, heightM: 1.4, sensorCount: 4, targetC: 55 };

let company: { id: string; tag: string; domain: string };
let other: { id: string; tag: string; domain: string };
let homeId: string;
let tankId: string;
let engineer: string, admin: string, operator: string, otherAdmin: string;

async function homeWithTank(companyId: string, tag: string): Promise<{ homeId: string; tankId: string }> {
  const [home] = await query<{ id: string }>(
    `insert into homes (company_id, reference, address_line, town, postcode, occupants) values ($1, $2, '7 Weir Lane', 'Cobbmere', 'WM9 3ZZ', 3) returning id`,
    [companyId, `CI-${tag}`],
  );
  const [tank] = await query<{ id: string }>(
    `insert into tanks (company_id, home_id, serial, model, volume_l, height_m, sensor_count, heat_source, hp_output_w, immersion_w, target_c, hysteresis_k)
     values ($1, $2, $3, 'C210 cylinder', 210, 1.4, 4, 'hp_plate', 5000, 3000, 55, 5) returning id`,
    [companyId, home!.id, `CI${tag}`],
  );
  // The latest state as the writer left it: the column, and figures from EN 16147's 10 °C.
  const f = tankFigures({ layersC: LAYERS_C }, geometry);
  await query(
    `insert into tank_latest_state (tank_id, ts, last_seen_at, layers_cc, soc, v40_l, figures_quality, compressor, online)
    values ($1, now(), now(), $2, $3, $4, $5, false, true)`,
    [tank!.id, LAYERS_C.map((c) => c * 100), f.soc, f.v40L, JSON.stringify(f.quality)],
  );
  return { homeId: home!.id, tankId: tank!.id };
}

const listed = async (cookie: string) =>
  (await call(cookie, 'GET', `/api/tanks?q=CI${company.tag}`)).body.items.find((t: { id: string }) => t.id === tankId);
const detail = async (cookie: string) => (await call(cookie, 'GET', `/api/tanks/${tankId}`)).body;
const stored = async () =>
  (await query<{ c: number | null }>('select cold_inlet_c as c from homes where id = $1', [homeId]))[0]!.c;

beforeAll(async () => {
  company = await ownCompany('Weirmoor');
  other = await ownCompany('Saltings');
  ({ homeId, tankId } = await homeWithTank(company.id, company.tag));
  [engineer, admin, operator, otherAdmin] = [
    await staffOf(company, 'engineer'),
    await staffOf(company, 'admin'),
    await staffOf(company, 'operator'),
    await staffOf(other, 'admin'),
  ];
}, 60_000);

afterAll(async () => {
  await dropCompany(company.id);
  await dropCompany(other.id);
  await closeTestDb();
});

describe('a home’s cold inlet', () => {
  it('counts every figure from EN 16147’s 10 °C until one is set', async () => {
    const home = await call(engineer, 'GET', `/api/homes/${homeId}`);
    expect(home.status).toBe(200);
    expect(home.body).toMatchObject({ id: homeId, coldInletC: null, coldWaterC: 10, coldWaterFrom: 'EN 16147' });
    expect((await detail(engineer)).figures.coldC).toBe(10);
  });

  it('recomputes the tanks’ figures at once: the list and the tank page agree with the thermal core', async () => {
    const before = await listed(engineer);
    const res = await call(engineer, 'PATCH', `/api/homes/${homeId}`, { coldInletC: 15 });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body).toMatchObject({ homeId, coldInletC: 15, previousC: null, tanksUpdated: 1 });
    // EN 16147's V40 by mixing: a warmer supply needs less hot water for each litre at 40 °C, so
    // the same store gives more V40 (and holds less heat above the supply).
    const expected = tankFigures({ layersC: LAYERS_C }, { ...geometry, coldInletC: 15 });
    const after = await listed(engineer);
    const page = await detail(engineer);
    expect(page.figures.coldC).toBe(15);
    expect(after.v40L).toBeCloseTo(expected.v40L!, 1);
    expect(page.figures.v40L).toBeCloseTo(expected.v40L!, 1);
    expect(after.v40L).toBeGreaterThan(before.v40L);
    expect(after.soc).toBeCloseTo(expected.soc!, 3);
    expect(page.figures.soc).toBeCloseTo(expected.soc!, 3);
    const [audit] = await query<{ detail: { fromC: number | null; toC: number } }>(
      `select detail from audit_log where action = 'home.cold_inlet_changed' and subject = $1 order by id desc limit 1`,
      [`home:${homeId}`],
    );
    expect(audit!.detail).toMatchObject({ fromC: null, toC: 15 });
  });

  it('refuses a value that is not a cold supply, naming the field, and changes nothing', async () => {
    for (const body of [
      { coldInletC: 40 },
      { coldInletC: 0 },
      { coldInletC: 'cold' },
      {},
      { coldInletC: 12, colour: 'blue' },
    ]) {
      const res = await call(admin, 'PATCH', `/api/homes/${homeId}`, body);
      expect(res.status, JSON.stringify(body)).toBe(400);
      expect(res.body.error.fields.map((f: { field: string }) => f.field).join(' '), JSON.stringify(body)).toMatch(
        /coldInletC|\(body\)/,
      );
    }
    const res = await call(admin, 'PATCH', `/api/homes/${homeId}`, '{"coldInletC": 1');
    expect(res.status).toBe(400);
    expect(await stored()).toBe(15);
  });

  it('goes back to EN 16147’s 10 °C with null', async () => {
    const res = await call(admin, 'PATCH', `/api/homes/${homeId}`, { coldInletC: null });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ coldInletC: null, previousC: 15 });
    const plain = tankFigures({ layersC: LAYERS_C }, geometry);
    expect((await listed(admin)).v40L).toBeCloseTo(plain.v40L!, 1);
    expect((await detail(admin)).figures.coldC).toBe(10);
  });

  it('is for admins and engineers of the home’s own company', async () => {
    expect((await call(operator, 'PATCH', `/api/homes/${homeId}`, { coldInletC: 12 })).status).toBe(403);
    const foreign = await call(otherAdmin, 'PATCH', `/api/homes/${homeId}`, { coldInletC: 12 });
    expect(foreign.status).toBe(404);
    expect((await call(otherAdmin, 'GET', `/api/homes/${homeId}`)).status).toBe(404);
    expect((await call(admin, 'PATCH', '/api/homes/not-a-home', { coldInletC: 12 })).status).toBe(404);
    expect((await call(admin, 'PATCH', '/api/homes/%00', { coldInletC: 12 })).status).toBe(404);
    expect(await stored()).toBeNull();
  });
});
