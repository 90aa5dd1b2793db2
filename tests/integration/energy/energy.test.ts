import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { localDayBounds } from '../../../src/lib/energy';
import { createAccount } from '../../support/accounts';
import { closeTestDb, query } from '../../support/db';
import { signIn, signInAs } from '../../support/session';
import { call, dropTanks, makeTank, setHomeTariff, writeHandWorkedDay, type EnergyTank } from './fixtures';

let tank: EnergyTank;
let day: string;
const cookies: Record<string, string> = {};

beforeAll(async () => {
  // Declared loss 45 W → UA = 45 W / 45 K = 1 W/K (EN 12897 rates loss 45 K above the room: from memory).
  tank = await makeTank('kestrel-vale', { declaredLossW: 45 });
  day = new Date(Date.now() - 86_400_000).toISOString().slice(0, 10);
  const { startMs } = localDayBounds(day, 'Europe/London');
  // Day/night: 10 p/kWh from 00:30 to 05:30 local, 30 p/kWh otherwise (test values).
  await setHomeTariff(tank, {
    kind: 'day_night',
    timeZone: 'Europe/London',
    nightStartMin: 30,
    nightEndMin: 330,
    dayImportPence: 30,
    nightImportPence: 10,
    exportPence: 0,
    validFromMs: startMs - 86_400_000,
    validToMs: null,
  });
  await writeHandWorkedDay(tank, day);
  const own = await createAccount({
    company: 'kestrel-vale',
    role: 'householder',
    homeId: tank.homeId,
    label: 'energy-home',
  });
  [cookies.engineer, cookies.own, cookies.otherHouseholder, cookies.otherCompany] = await Promise.all([
    signInAs(process.env.TEST_BASE_URL!, 'engineer'),
    signIn(process.env.TEST_BASE_URL!, own.email, own.password),
    signInAs(process.env.TEST_BASE_URL!, 'householder'),
    signInAs(process.env.TEST_BASE_URL!, 'operator', 'orrin-bay'),
  ]);
}, 60_000);
afterAll(async () => {
  await query('delete from tariffs where home_id = $1', [tank.homeId]);
  await dropTanks();
  await closeTestDb();
});

describe('GET /api/tanks/{id}/energy', () => {
  it('accounts the day against the hand-worked figures', async () => {
    const today = new Date().toISOString().slice(0, 10);
    const res = await call(cookies.engineer!, 'GET', `/api/tanks/${tank.id}/energy?from=${day}&to=${today}`);
    expect(res.status).toBe(200);
    expect(res.body.tariffSource).toBe('home');
    // Today holds only the closing midnight reading: no interval, so no day.
    expect(res.body.days).toHaveLength(1);
    const d = res.body.days[0];
    expect(d.date).toBe(day);
    expect(d.coveredMinutes).toBe(d.endMs / 60_000 - d.startMs / 60_000);
    // Heat pump: 1000 W × 1 h = 1 kWh, all in the night window at 10 p → 10 p (arithmetic).
    expect(d.heatPumpElectricityKWh).toBeCloseTo(1, 9);
    expect(d.heatPumpCostPence).toBeCloseTo(10, 9);
    // Immersion: 3000 W × 0.5 h = 1.5 kWh at the day price 30 p → 45 p; an element turns all its electricity into heat.
    expect(d.immersionGridElectricityKWh).toBeCloseTo(1.5, 9);
    expect(d.immersionGridHeatKWh).toBeCloseTo(1.5, 9);
    expect(d.costPence).toBeCloseTo(55, 9);
    // Standing loss: UA·(mean layer − ambient)·t = 1 W/K × (42.5 − 20) K × 24 h = 0.54 kWh (Newton's law of cooling; 20 °C room, EN 12897: from memory).
    const hours = (d.endMs - d.startMs) / 3_600_000;
    expect(d.standingLossKWh).toBeCloseTo((22.5 * hours) / 1000, 9);
    // Draw: 50 L at 60 °C with 10 °C mains mixes to 50 × (60 − 10)/(40 − 10) = 83.3 L at 40 °C
    // (EN 16147's V40; water properties shift it by under 2 %, IAPWS-IF97).
    expect(d.drawnLitres40 / 83.333).toBeGreaterThan(0.98);
    expect(d.drawnLitres40 / 83.333).toBeLessThan(1.02);
    expect(d.storedChangeKWh).toBeCloseTo(0, 9);
    // The month holds the same day.
    expect(res.body.months).toEqual([
      expect.objectContaining({ month: day.slice(0, 7), days: 1, costPence: d.costPence }),
    ]);
    expect(res.body.totals).toMatchObject({ days: 1 });
    expect(res.body.totals.costPence).toBeCloseTo(55, 9);
  });

  it('shows the householder their own home, and nobody else’s', async () => {
    expect((await call(cookies.own!, 'GET', `/api/tanks/${tank.id}/energy?from=${day}&to=${day}`)).status).toBe(200);
    expect(
      (await call(cookies.otherHouseholder!, 'GET', `/api/tanks/${tank.id}/energy?from=${day}&to=${day}`)).status,
    ).toBe(404);
    expect(
      (await call(cookies.otherCompany!, 'GET', `/api/tanks/${tank.id}/energy?from=${day}&to=${day}`)).status,
    ).toBe(404);
  });

  it('refuses a bad range naming the field', async () => {
    const res = await call(cookies.engineer!, 'GET', `/api/tanks/${tank.id}/energy?from=2026-01-01&to=2026-12-31`);
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual([
      expect.objectContaining({ field: 'to', message: expect.stringMatching(/at most 62/) }),
    ]);
    expect(
      (await call(cookies.engineer!, 'GET', `/api/tanks/${tank.id}/energy?from=yesterday`)).body.error.fields[0].field,
    ).toBe('from');
  });
});
