// The desk's fleet energy figures: averages and Tukey outliers read from the stored days, scoped to
// the company; and the energy-day job that writes those days from readings, tariffs and the queue.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeDb } from '../../../src/db';
import { localDayBounds } from '../../../src/lib/energy';
import { refreshEnergyDays } from '../../../src/lib/tank-energy/energy-days.server';
import { closeTestDb, query } from '../../support/db';
import { signInAs } from '../../support/session';
import {
  base,
  call,
  dropCompany,
  dropTanks,
  homeWithDays,
  makeTank,
  ownCompany,
  setHomeTariff,
  staffOf,
  writeHandWorkedDay,
  type EnergyTank,
} from './fixtures';

const DAY_MS = 86_400_000;
const dateOf = (ms: number) => new Date(ms).toISOString().slice(0, 10);
// The range the test asks for: five days ending a week ago (well clear of "today").
const to = dateOf(Date.now() - 7 * DAY_MS);
const from = dateOf(Date.parse(`${to}T00:00:00Z`) - 4 * DAY_MS);
const rangeDays = Array.from({ length: 5 }, (_, i) => dateOf(Date.parse(`${from}T00:00:00Z`) + i * DAY_MS));

let company: { id: string; operator: string; engineer: string };
const tankIds: string[] = [];

// Eight comparable homes, each drawing 100 L at 40 °C a day with 1 kWh of heat-pump electricity a
// day, so that a day's cost in pence is its cost per 100 L and its heat-pump heat is its DHW COP.
const costPer100L = [10, 11, 12, 13, 14, 15, 16, 40];
const cop = [2.6, 2.7, 2.8, 2.9, 3.0, 3.1, 3.2, 1.0];
let expensive: string;

beforeAll(async () => {
  const c = await ownCompany('Fernholt');
  company = { id: c.id, operator: await staffOf(c, 'operator'), engineer: await staffOf(c, 'engineer') };
  for (let i = 0; i < 8; i++) {
    const id = await homeWithDays(
      c.id,
      i + 1,
      rangeDays.map((date) => ({ date, litres: 100, cost: costPer100L[i]!, hpElec: 1, hpHeat: cop[i]! })),
    );
    tankIds.push(id);
    if (i === 7) expensive = id;
  }
  // Mostly away: 5 L a day (below 15 L, the least compared) at 10 p a day, and a heat pump that hardly ran (0.1 kWh a day).
  tankIds.push(
    await homeWithDays(
      c.id,
      9,
      rangeDays.map((date) => ({ date, litres: 5, cost: 10, hpElec: 0.1, hpHeat: 0.05 })),
    ),
  );
  // Only two days in the range (three are needed), however odd they are.
  tankIds.push(
    await homeWithDays(
      c.id,
      10,
      rangeDays.slice(0, 2).map((date) => ({ date, litres: 100, cost: 500, hpElec: 1, hpHeat: 0.2 })),
    ),
  );
  // A day outside the range is not counted.
  await query(
    `insert into energy_days (tank_id, day, company_id, cost_pence, heat_pump_heat_kwh, heat_pump_electricity_kwh, immersion_grid_heat_kwh,
      immersion_solar_heat_kwh, drawn_litres40, standing_loss_kwh, solar_export_forgone_pence, unpriced_kwh, covered_minutes)
    values ($1, ($2::date - 1), $3, 99999, 0, 50, 0, 0, 1, 0, 0, 0, 1440)`,
    [tankIds[0], from, c.id],
  );
}, 60_000);

afterAll(async () => {
  await dropCompany(company.id);
  await dropTanks();
  await closeDb();
  await closeTestDb();
});

describe('GET /api/fleet/energy', () => {
  it('gives the fleet’s averages over the stored days in the range', async () => {
    const res = await call(company.operator, 'GET', `/api/fleet/energy?from=${from}&to=${to}`);
    expect(res.status).toBe(200);
    const b = res.body;
    expect(b).toMatchObject({ from, to, homes: 10, homeDays: 8 * 5 + 5 + 2 });
    // Cost: 5 days × (10+11+12+13+14+15+16+40 = 131) p + 5 × 10 p + 2 × 500 p = 655 + 50 + 1000 = 1705 p over 47 home-days.
    expect(b.averages.costPencePerHomeDay).toBeCloseTo(1705 / 47, 6);
    // Litres: 8 × 500 + 25 + 200 = 4225 L → 1705 p / 4225 L × 100 = 40.355 p per 100 L.
    expect(b.averages.costPencePer100L).toBeCloseTo((1705 / 4225) * 100, 6);
    // DHW COP, fleet heat over fleet electricity: heat 5 × (2.6+2.7+2.8+2.9+3.0+3.1+3.2+1.0 = 21.3) + 5 × 0.05 + 2 × 0.2 = 107.15 kWh;
    // electricity 8 × 5 + 0.5 + 2 = 42.5 kWh → 2.5212.
    expect(b.averages.dhwCop).toBeCloseTo(107.15 / 42.5, 5);
    expect(b.averages.solarHeatKWh).toBeCloseTo(47 * 0.5, 4);
  });

  it('fences each figure at Q1 − 1.5·IQR and Q3 + 1.5·IQR (Tukey 1977) and lists the homes outside', async () => {
    const b = (await call(company.operator, 'GET', `/api/fleet/energy?from=${from}&to=${to}`)).body;
    // Cost per 100 L of the eight comparable homes: 10 11 12 13 14 15 16 40 (the other two are left out).
    // Linear-interpolated quartiles (Hyndman & Fan type 7): Q1 at position 1 + 7 × 0.25 = 2.75 → 11.75;
    // median at 4.5 → 13.5; Q3 at 6.25 → 15.25. IQR 3.5; fences 11.75 − 5.25 = 6.5 and 15.25 + 5.25 = 20.5.
    const c = b.fences.cost_per_100l;
    expect(c.homes).toBe(8);
    expect(c.q1).toBeCloseTo(11.75, 9);
    expect(c.median).toBeCloseTo(13.5, 9);
    expect(c.q3).toBeCloseTo(15.25, 9);
    expect(c.low).toBeCloseTo(6.5, 9);
    expect(c.high).toBeCloseTo(20.5, 9);
    // DHW COP: 1.0 2.6 2.7 2.8 2.9 3.0 3.1 3.2 → Q1 2.675, median 2.85, Q3 3.025, IQR 0.35; fences 2.15 and 3.55.
    // (Stored as real, single precision: compared to 6 places.)
    const p = b.fences.dhw_cop;
    expect(p.homes).toBe(8);
    expect(p.q1).toBeCloseTo(2.675, 6);
    expect(p.q3).toBeCloseTo(3.025, 6);
    expect(p.low).toBeCloseTo(2.15, 6);
    expect(p.high).toBeCloseTo(3.55, 6);
    // Only the eighth home is outside: 40 p per 100 L is (40 − 15.25) / 3.5 − 1.5 = 5.571 IQRs beyond the upper fence,
    // COP 1.0 is (2.675 − 1.0) / 0.35 − 1.5 = 3.286 IQRs below the lower one.
    expect(b.outliers).toHaveLength(2);
    const cost = b.outliers.find((o: { metric: string }) => o.metric === 'cost_per_100l');
    const low = b.outliers.find((o: { metric: string }) => o.metric === 'dhw_cop');
    expect(cost).toMatchObject({ tankId: expensive, side: 'high', days: 5, town: 'Tarnfield' });
    expect(cost.value).toBeCloseTo(40, 9);
    expect(cost.beyondIqr).toBeCloseTo((40 - 15.25) / 3.5 - 1.5, 9);
    expect(low).toMatchObject({ tankId: expensive, side: 'low' });
    expect(low.value).toBeCloseTo(1.0, 6);
    expect(low.beyondIqr).toBeCloseTo((2.675 - 1.0) / 0.35 - 1.5, 5);
    expect(cost.homeReference).toMatch(/^FH-8-/);
  });

  it('shows each company only its own homes, and only to the desk', async () => {
    const kestrel = await call(await signInAs(base(), 'operator'), 'GET', `/api/fleet/energy?from=${from}&to=${to}`);
    expect(kestrel.status).toBe(200);
    expect(kestrel.body.outliers.map((o: { tankId: string }) => o.tankId)).not.toContain(expensive);
    expect((await call(company.engineer, 'GET', `/api/fleet/energy?from=${from}&to=${to}`)).status).toBe(403);
    expect((await call(await signInAs(base(), 'householder'), 'GET', '/api/fleet/energy')).status).toBe(403);
  });

  it('compares cost per litre among heat-pump homes only, and still counts an immersion-only home in the averages', async () => {
    const c = await ownCompany('Marrowby');
    const operator = await staffOf(c, 'operator');
    try {
      for (let i = 0; i < 8; i++)
        await homeWithDays(
          c.id,
          i + 1,
          rangeDays.map((date) => ({ date, litres: 100, cost: 10 + i, hpElec: 1, hpHeat: 2.8 })),
        );
      // Immersion only: 100 L at 40 °C a day for 40 p, far above the heat-pump homes' upper fence.
      const immersion = await homeWithDays(
        c.id,
        9,
        rangeDays.map((date) => ({ date, litres: 100, cost: 40, hpElec: 0, hpHeat: 0 })),
        'immersion_only',
      );
      const b = (await call(operator, 'GET', `/api/fleet/energy?from=${from}&to=${to}`)).body;
      expect(b.homes).toBe(9);
      expect(b.fences.cost_per_100l.homes).toBe(8);
      expect(b.outliers.map((o: { tankId: string }) => o.tankId)).not.toContain(immersion);
    } finally {
      await dropCompany(c.id);
    }
  });

  it('refuses a bad range naming the field', async () => {
    const bad = await call(company.operator, 'GET', '/api/fleet/energy?from=last-week');
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields[0].field).toBe('from');
    const long = await call(company.operator, 'GET', '/api/fleet/energy?from=2025-01-01&to=2026-06-30');
    expect(long.status).toBe(400);
    expect(long.body.error.fields).toEqual([
      expect.objectContaining({ field: 'to', message: expect.stringMatching(/at most 366/) }),
    ]);
    const unknown = await call(company.operator, 'GET', '/api/fleet/energy?sort=cost');
    expect(unknown.status).toBe(400);
  });

  it('answers an empty range with no figures rather than an error', async () => {
    const b = (await call(company.operator, 'GET', '/api/fleet/energy?from=2020-01-01&to=2020-01-31')).body;
    expect(b).toMatchObject({ homes: 0, homeDays: 0, outliers: [], fences: { cost_per_100l: null, dhw_cop: null } });
    expect(b.averages.costPencePerHomeDay).toBeNull();
  });
});

describe('the energy-day job', () => {
  let tank: EnergyTank;
  let day: string;

  beforeAll(async () => {
    // The hand-worked day of tests/integration/energy/energy.test.ts: costs 55 p at these prices.
    tank = await makeTank('kestrel-vale', { declaredLossW: 45 });
    day = dateOf(Date.now() - 2 * DAY_MS);
    const { startMs } = localDayBounds(day, 'Europe/London');
    await setHomeTariff(tank, {
      kind: 'day_night',
      timeZone: 'Europe/London',
      nightStartMin: 30,
      nightEndMin: 330,
      dayImportPence: 30,
      nightImportPence: 10,
      exportPence: 0,
      validFromMs: startMs - DAY_MS,
      validToMs: null,
    });
    await writeHandWorkedDay(tank, day);
  }, 60_000);
  afterAll(async () => {
    await query('delete from tariffs where home_id = $1', [tank.homeId]);
  });

  it('queues the hours whose hourly rollup is written (trigger on rollups_1h)', async () => {
    const { startMs } = localDayBounds(day, 'Europe/London');
    const hour = new Date(startMs + 5 * 3_600_000);
    await query(
      `insert into rollups_1h (tank_id, bucket, samples, layers_avg_cc, compressor_samples, immersion_samples) values ($1, $2, 60, '{2000,4000,5000,6000}', 0, 0)`,
      [tank.id, hour],
    );
    await query(`update rollups_1h set samples = 59 where tank_id = $1 and bucket = $2`, [tank.id, hour]);
    const queued = await query<{ n: number }>(
      `select count(*)::int as n from energy_day_dirty where tank_id = $1 and hour = $2`,
      [tank.id, hour],
    );
    expect(queued[0]!.n).toBe(1);
  });

  it('stores the day as the tank’s own energy endpoint accounts it, once the day has ended', async () => {
    // The worker's own job may take the queued hour first; either way the day ends up stored.
    for (let i = 0; i < 5; i++) await refreshEnergyDays({ limit: 5000 });
    const [row] = await query<{
      cost_pence: number;
      heat_pump_electricity_kwh: number;
      immersion_grid_heat_kwh: number;
      drawn_litres40: number;
      company_id: string;
    }>(
      `select cost_pence, heat_pump_electricity_kwh, immersion_grid_heat_kwh, drawn_litres40, company_id from energy_days where tank_id = $1 and day = $2`,
      [tank.id, day],
    );
    // 1 kWh of heat pump at 10 p + 1.5 kWh of immersion at 30 p = 55 p (arithmetic of the hand-worked day).
    expect(row).toBeDefined();
    expect(row!.cost_pence).toBeCloseTo(55, 3);
    expect(row!.heat_pump_electricity_kwh).toBeCloseTo(1, 5);
    expect(row!.immersion_grid_heat_kwh).toBeCloseTo(1.5, 5);
    expect(row!.company_id).toBe(tank.companyId);
    const api = await call(
      await signInAs(base(), 'engineer'),
      'GET',
      `/api/tanks/${tank.id}/energy?from=${day}&to=${day}`,
    );
    expect(row!.drawn_litres40).toBeCloseTo(api.body.days[0].drawnLitres40, 3);
  });

  it('accounts the days a new tariff prices again (queued when it is stored)', async () => {
    const admin = await signInAs(base(), 'admin');
    const { startMs } = localDayBounds(day, 'Europe/London');
    // A flat 20 p/kWh for this home from the start of the day: 2.5 kWh × 20 p = 50 p.
    const res = await call(admin, 'POST', '/api/tariffs', {
      homeId: tank.homeId,
      tariff: { kind: 'flat', unit: 'p/kWh', import: 20, export: 0, validFrom: new Date(startMs).toISOString() },
    });
    expect(res.status).toBe(201);
    for (let i = 0; i < 5; i++) await refreshEnergyDays({ limit: 5000 });
    const [row] = await query<{ cost_pence: number }>(
      `select cost_pence from energy_days where tank_id = $1 and day = $2`,
      [tank.id, day],
    );
    expect(row!.cost_pence).toBeCloseTo(50, 3);
  });
});
