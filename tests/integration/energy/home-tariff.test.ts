// A single home's tariff through the API: staff set it with its validity period, it overrides the
// company default only for those dates, bad input is refused naming the field, other companies'
// homes are not found.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { localDayBounds } from '../../../src/lib/energy';
import { closeTestDb, query } from '../../support/db';
import { signInAs } from '../../support/session';
import { base, call, dropCompany, ownCompany, staffOf, writeHandWorkedDay, type EnergyTank } from './fixtures';

const DAY_MS = 86_400_000;
const dateOf = (ms: number) => new Date(ms).toISOString().slice(0, 10);
// Two local days a day apart (each fixture day brings the next midnight's reading): the first priced
// by the company default, the second by the home's own tariff.
const first = dateOf(Date.now() - 4 * DAY_MS);
const second = dateOf(Date.now() - 2 * DAY_MS);
const startOf = (d: string) => new Date(localDayBounds(d, 'Europe/London').startMs).toISOString();

let company: string;
let tank: EnergyTank;
let engineer: string;
let admin: string;
const ownTariffs = async () =>
  (await query<{ n: number }>('select count(*)::int as n from tariffs where home_id = $1', [tank.homeId]))[0]!.n;

beforeAll(async () => {
  // A company of its own, so that its default tariff prices nobody else's homes.
  const c = await ownCompany('Fenwick');
  company = c.id;
  const tag = c.tag;
  const [home] = await query<{ id: string }>(
    `insert into homes (company_id, reference, address_line, town, postcode, occupants) values ($1, $2, '4 Mere Close', 'Cobbmere', 'WM9 2ZZ', 2) returning id`,
    [company, `FW-${tag}`],
  );
  const [t] = await query<{ id: string }>(
    `insert into tanks (company_id, home_id, serial, model, volume_l, height_m, sensor_count, heat_source, hp_output_w, immersion_w, declared_loss_w, target_c, hysteresis_k)
     values ($1, $2, $3, 'C210 cylinder', 210, 1.4, 4, 'hp_plate', 5000, 3000, 45, 55, 5) returning id`,
    [company, home!.id, `FW${tag}`],
  );
  tank = { id: t!.id, serial: `FW${tag}`, homeId: home!.id, companyId: company };
  // The company default: a flat 20 p/kWh since a week ago (test price).
  await query(`insert into tariffs (company_id, home_id, kind, valid_from, prices) values ($1, null, 'flat', $2, $3)`, [
    company,
    new Date(Date.now() - 7 * DAY_MS),
    JSON.stringify({
      kind: 'flat',
      importPence: 20,
      exportPence: 0,
      validFromMs: Date.now() - 7 * DAY_MS,
      validToMs: null,
    }),
  ]);
  await writeHandWorkedDay(tank, first);
  await writeHandWorkedDay(tank, second);
  [engineer, admin] = [await staffOf(c, 'engineer'), await staffOf(c, 'admin')];
}, 60_000);

afterAll(async () => {
  await dropCompany(company);
  await closeTestDb();
});

describe('a home’s own tariff', () => {
  it('refuses bad fields by name and stores nothing', async () => {
    const res = await call(engineer, 'POST', '/api/tariffs', {
      homeId: tank.homeId,
      tariff: {
        kind: 'day_night',
        unit: 'p/kWh',
        nightStart: '25:00',
        nightEnd: '05:30',
        dayImport: 30,
        nightImport: 'cheap',
        validFrom: startOf(second),
      },
    });
    expect(res.status).toBe(422);
    expect(res.body.error.fields).toEqual(
      expect.arrayContaining([
        expect.objectContaining({ field: 'tariff.nightStart', message: expect.stringMatching(/HH:MM/) }),
        expect.objectContaining({ field: 'tariff.nightImport', message: expect.stringMatching(/must be a number/) }),
      ]),
    );
    // A price far above any plausible one is taken for pounds entered as pence (500 p/kWh, a product limit: common practice).
    const pounds = await call(engineer, 'POST', '/api/tariffs', {
      homeId: tank.homeId,
      tariff: { kind: 'flat', unit: '£/kWh', import: 12, validFrom: startOf(second) },
    });
    expect(pounds.status).toBe(422);
    expect(pounds.body.error.fields).toEqual([
      expect.objectContaining({ field: 'tariff.import', message: expect.stringMatching(/check the unit/) }),
    ]);
    const backwards = await call(engineer, 'POST', '/api/tariffs', {
      homeId: tank.homeId,
      tariff: { kind: 'flat', unit: 'p/kWh', import: 12, validFrom: startOf(second), validTo: startOf(first) },
    });
    expect(backwards.body.error.fields).toEqual([
      expect.objectContaining({ field: 'tariff.validTo', message: 'validTo must be after validFrom.' }),
    ]);
    expect(await ownTariffs()).toBe(0);
  });

  it('is stored with its validity period and overrides the default for those days only', async () => {
    // A flat 10 p/kWh for the second day only: from its start to the start of the day after.
    const res = await call(engineer, 'POST', '/api/tariffs', {
      homeId: tank.homeId,
      tariff: {
        kind: 'flat',
        name: 'Home tariff (test)',
        unit: 'p/kWh',
        import: 10,
        export: 5,
        validFrom: startOf(second),
        validTo: startOf(dateOf(Date.parse(`${second}T00:00:00Z`) + DAY_MS)),
      },
    });
    expect(res.status).toBe(201);
    expect(res.body.tariff).toMatchObject({
      homeId: tank.homeId,
      kind: 'flat',
      name: 'Home tariff (test)',
      validFrom: startOf(second),
    });
    expect(await ownTariffs()).toBe(1);
    const energy = await call(engineer, 'GET', `/api/tanks/${tank.id}/energy?from=${first}&to=${second}`);
    expect(energy.body.tariffSource).toBe('home');
    const a = energy.body.days.find((d: { date: string }) => d.date === first);
    const b = energy.body.days.find((d: { date: string }) => d.date === second);
    // Each hand-worked day uses 1 kWh of heat-pump and 1.5 kWh of immersion electricity = 2.5 kWh:
    // the first at the default 20 p = 50 p, the second at the home's 10 p = 25 p.
    expect(a.costPence).toBeCloseTo(50, 9);
    expect(b.costPence).toBeCloseTo(25, 9);
    const list = await call(admin, 'GET', `/api/tariffs?homeId=${tank.homeId}`);
    expect(list.body.tariffs.map((t: { homeId: string | null }) => (t.homeId ? 'home' : 'company')).sort()).toEqual([
      'company',
      'home',
    ]);
  });

  it('is not found for another company, and not for householders to set', async () => {
    const other = await call(await signInAs(base(), 'engineer', 'orrin-bay'), 'POST', '/api/tariffs', {
      homeId: tank.homeId,
      tariff: { kind: 'flat', unit: 'p/kWh', import: 12, validFrom: startOf(second) },
    });
    expect(other.status).toBe(404);
    const page = await fetch(`${base()}/homes/${tank.homeId}/tariff`, {
      headers: { cookie: await signInAs(base(), 'engineer', 'orrin-bay') },
      redirect: 'manual',
    });
    expect(page.status).toBe(404);
    expect(
      (await call(await signInAs(base(), 'householder'), 'POST', '/api/tariffs', { homeId: tank.homeId, tariff: {} }))
        .status,
    ).toBe(403);
    expect(await ownTariffs()).toBe(1);
  });
});
