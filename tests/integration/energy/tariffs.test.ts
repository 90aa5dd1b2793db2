import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeTestDb, query } from '../../support/db';
import { signInAs } from '../../support/session';
import { call, dropTanks, makeTank, type EnergyTank } from './fixtures';

let tank: EnergyTank;
let foreign: EnergyTank;
const cookies: Record<string, string> = {};
const stored = async (homeId: string) =>
  (await query<{ n: number }>('select count(*)::int as n from tariffs where home_id = $1', [homeId]))[0]!.n;

/** Half-hourly rows from 2026-12-07T00:00Z, one per slot, 14.2 p import and 4.1 p export unless told otherwise. */
function csv(rows: { start: string; end: string; imp?: string; unit?: string }[]): string {
  return [
    'start,end,import,export,unit',
    ...rows.map((r) => `${r.start},${r.end},${r.imp ?? '14.2'},4.1,${r.unit ?? 'p/kWh'}`),
  ].join('\n');
}
const slot = (i: number) => {
  const a = Date.parse('2026-12-07T00:00:00Z') + i * 1_800_000;
  return {
    start: new Date(a).toISOString().replace('.000', ''),
    end: new Date(a + 1_800_000).toISOString().replace('.000', ''),
  };
};

beforeAll(async () => {
  tank = await makeTank('kestrel-vale');
  foreign = await makeTank('orrin-bay');
  [cookies.engineer, cookies.operator, cookies.householder, cookies.otherAdmin, cookies.otherOperator] =
    await Promise.all([
      signInAs(process.env.TEST_BASE_URL!, 'engineer'),
      signInAs(process.env.TEST_BASE_URL!, 'operator'),
      signInAs(process.env.TEST_BASE_URL!, 'householder'),
      signInAs(process.env.TEST_BASE_URL!, 'admin', 'orrin-bay'),
      signInAs(process.env.TEST_BASE_URL!, 'operator', 'orrin-bay'),
    ]);
}, 60_000);
afterAll(async () => {
  await query(`delete from tariffs where home_id = any($1::uuid[]) or name = 'Orrin test default'`, [
    [tank.homeId, foreign.homeId],
  ]);
  await dropTanks();
  await closeTestDb();
});

describe('POST /api/tariffs (CSV of half-hourly prices)', () => {
  it('refuses a gap, an overlap and a bad unit with each row and reason, and stores nothing', async () => {
    // Lines: 2 = slot 0, 3 = slot 1, 4 = slot 3 (slot 2 missing: a gap), 5 = slot 3 again (overlap), 6 = slot 4 in kW.
    const text = csv([slot(0), slot(1), slot(3), slot(3), { ...slot(4), unit: 'kW' }]);
    const res = await call(cookies.engineer!, 'POST', `/api/tariffs?homeId=${tank.homeId}`, text, 'text/csv');
    expect(res.status).toBe(422);
    expect(res.body.error.code).toBe('TariffRefused');
    const rows = res.body.error.rows as { row: number; field: string; message: string }[];
    expect(rows.find((r) => r.row === 4)).toMatchObject({
      field: 'start',
      message: expect.stringMatching(/gap of 30 minutes/),
    });
    expect(rows.find((r) => r.row === 5)).toMatchObject({
      field: 'start',
      message: expect.stringMatching(/overlaps line 4/),
    });
    expect(rows.find((r) => r.row === 6)).toMatchObject({
      field: 'unit',
      message: expect.stringMatching(/unit "kW" is not known/),
    });
    expect(res.body.error.fields.length).toBe(rows.length);
    expect(await stored(tank.homeId)).toBe(0);
  });

  it('refuses a price entered in pounds that is really pence (above the plausible 500 p/kWh, a product limit: common practice)', async () => {
    const res = await call(
      cookies.engineer!,
      'POST',
      `/api/tariffs?homeId=${tank.homeId}`,
      csv([{ ...slot(0), imp: '14.2', unit: '£/kWh' }]),
      'text/csv',
    );
    expect(res.status).toBe(422);
    expect(res.body.error.rows[0]).toMatchObject({
      row: 2,
      field: 'import',
      message: expect.stringMatching(/check the unit/),
    });
    expect(await stored(tank.homeId)).toBe(0);
  });

  it('stores a good upload for the home and lists it beside the company defaults', async () => {
    const res = await call(
      cookies.engineer!,
      'POST',
      `/api/tariffs?homeId=${tank.homeId}&name=Test%20agile`,
      csv(Array.from({ length: 48 }, (_, i) => slot(i))),
      'text/csv',
    );
    expect(res.status).toBe(201);
    expect(res.body.tariff).toMatchObject({
      kind: 'half_hourly',
      homeId: tank.homeId,
      validFrom: '2026-12-07T00:00:00.000Z',
      validTo: '2026-12-08T00:00:00.000Z',
    });
    expect(res.body.tariff.prices.importPence).toHaveLength(48);
    expect(await stored(tank.homeId)).toBe(1);
    const list = await call(cookies.operator!, 'GET', `/api/tariffs?homeId=${tank.homeId}`);
    expect(list.status).toBe(200);
    const kinds = list.body.tariffs.map((t: any) => `${t.homeId ? 'home' : 'company'}:${t.kind}`);
    // The seeded demo defaults of the company, and the home's own.
    expect(kinds).toEqual(expect.arrayContaining(['home:half_hourly', 'company:flat', 'company:day_night']));
  });
});

describe('POST /api/tariffs (JSON form)', () => {
  it('refuses an unknown unit naming the field, and stores nothing', async () => {
    const res = await call(cookies.engineer!, 'POST', '/api/tariffs', {
      homeId: tank.homeId,
      tariff: { kind: 'flat', unit: 'kWh', import: 24, validFrom: '2026-01-01T00:00:00Z' },
    });
    expect(res.status).toBe(422);
    expect(res.body.error.fields).toEqual([expect.objectContaining({ field: 'tariff.unit' })]);
    expect(await stored(tank.homeId)).toBe(1);
  });

  it('leaves company defaults to admins, and a foreign home is not found', async () => {
    const flat = {
      kind: 'flat',
      name: 'Orrin test default',
      unit: 'p/kWh',
      import: 22,
      validFrom: '2030-01-01T00:00:00Z',
    };
    expect((await call(cookies.otherOperator!, 'POST', '/api/tariffs', { homeId: null, tariff: flat })).status).toBe(
      403,
    );
    const made = await call(cookies.otherAdmin!, 'POST', '/api/tariffs', { homeId: null, tariff: flat });
    expect(made.status).toBe(201);
    expect(made.body.tariff).toMatchObject({ homeId: null, kind: 'flat', prices: { importPence: 22, exportPence: 0 } });
    expect(
      (await call(cookies.engineer!, 'POST', '/api/tariffs', { homeId: foreign.homeId, tariff: flat })).status,
    ).toBe(404);
    expect((await call(cookies.engineer!, 'GET', `/api/tariffs?homeId=${foreign.homeId}`)).status).toBe(404);
    expect(
      (await call(cookies.householder!, 'POST', '/api/tariffs', { homeId: tank.homeId, tariff: flat })).status,
    ).toBe(403);
  });
});
