// Solar surplus end to end: readings carrying solarSurplusW go in through the device's own HTTP
// ingest, are stored in their column, and the energy API accounts the immersion's heat on them as
// free, against a day worked by hand.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { localDayBounds } from '../../../src/lib/energy';
import { generateDeviceToken, hashDeviceToken } from '../../../src/lib/telemetry/device-token';
import { closeTestDb, query } from '../../support/db';
import { signInAs } from '../../support/session';
import { base, call, dropTanks, makeTank, setHomeTariff, type EnergyTank } from './fixtures';

const MIN = 60_000;
let tank: EnergyTank;
let day: string;
let engineer: string;

/**
 * The hand-worked day (local times; layers held at 20/40/50/60 °C, so the stored energy never changes):
 *   01:00–02:00 compressor on, powerW 1000                         (night price 10 p/kWh)
 *   12:00–13:00 immersion 2000 W while the surplus is 1500 W      (day price 30 p/kWh)
 *   13:00–13:30 surplus 800 W, immersion off (nothing diverted)
 * Export earns 15 p/kWh.
 */
function handWorkedReading(startMs: number, m: number) {
  const r: Record<string, unknown> = {
    ts: startMs + m * MIN,
    layersC: [20, 40, 50, 60],
    compressor: m >= 60 && m < 120,
    immersionW: 0,
    powerW: 0,
    drawLpm: 0,
  };
  if (m >= 60 && m < 120) r.powerW = 1000;
  if (m >= 720 && m < 780) Object.assign(r, { immersionW: 2000, powerW: 2000, solarSurplusW: 1500 });
  if (m >= 780 && m < 810) r.solarSurplusW = 800;
  return r;
}

beforeAll(async () => {
  // Declared loss 45 W → UA = 1 W/K (EN 12897 rates loss 45 K above the room: from memory).
  tank = await makeTank('kestrel-vale', { declaredLossW: 45 });
  const token = generateDeviceToken();
  await query('update tanks set device_token_hash = $2 where id = $1', [tank.id, hashDeviceToken(token)]);
  day = new Date(Date.now() - 86_400_000).toISOString().slice(0, 10);
  const { startMs, endMs } = localDayBounds(day, 'Europe/London');
  // Day/night: 10 p/kWh from 00:30 to 05:30 local, 30 p/kWh otherwise, export 15 p/kWh (test values).
  await setHomeTariff(tank, {
    kind: 'day_night',
    timeZone: 'Europe/London',
    nightStartMin: 30,
    nightEndMin: 330,
    dayImportPence: 30,
    nightImportPence: 10,
    exportPence: 15,
    validFromMs: startMs - 86_400_000,
    validToMs: null,
  });
  const all = Array.from({ length: (endMs - startMs) / MIN + 1 }, (_, m) => handWorkedReading(startMs, m));
  for (let i = 0; i < all.length; i += 1000) {
    const res = await fetch(`${base()}/api/ingest`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', authorization: `Bearer ${token}` },
      body: JSON.stringify({ readings: all.slice(i, i + 1000) }),
    });
    expect(res.status).toBe(202);
    expect((await res.json()).rejected).toBe(0);
  }
  engineer = await signInAs(base(), 'engineer');
}, 60_000);
afterAll(async () => {
  await query('delete from tariffs where home_id = $1', [tank.homeId]);
  await dropTanks();
  await closeTestDb();
});

describe('solar surplus, from the wire to the cost', () => {
  it('stores each reading’s surplus in its column, and none where the device sent none', async () => {
    const [row] = await query<{ with_surplus: number; total: number; max: number }>(
      `select count(solar_surplus_w)::int as with_surplus, count(*)::int as total, max(solar_surplus_w)::int as max from readings where tank_id = $1`,
      [tank.id],
    );
    expect(row).toMatchObject({ with_surplus: 90, max: 1500 });
    expect(row!.total).toBeGreaterThan(1400);
  });

  it('accounts the immersion’s heat on surplus as free and prices only the grid part', async () => {
    const res = await call(engineer, 'GET', `/api/tanks/${tank.id}/energy?from=${day}&to=${day}`);
    expect(res.status).toBe(200);
    const d = res.body.days[0];
    // Immersion 2000 W × 1 h = 2 kWh of heat (an element turns all its electricity into heat; common practice),
    // of which the surplus covers 1500 W × 1 h = 1.5 kWh; the other 0.5 kWh comes from the grid.
    expect(d.immersionSolarHeatKWh).toBeCloseTo(1.5, 9);
    expect(d.immersionGridHeatKWh).toBeCloseTo(0.5, 9);
    expect(d.immersionGridElectricityKWh).toBeCloseTo(0.5, 9);
    // The 800 W surplus from 13:00 found the element off: nothing diverted, nothing accounted.
    // Cost: heat pump 1000 W × 1 h = 1 kWh at the night price 10 p = 10 p;
    //       immersion grid 0.5 kWh at the day price 30 p = 15 p; total 25 p.
    expect(d.heatPumpCostPence).toBeCloseTo(10, 9);
    expect(d.immersionCostPence).toBeCloseTo(15, 9);
    expect(d.costPence).toBeCloseTo(25, 9);
    // The 1.5 kWh of surplus would have earned 1.5 × 15 p = 22.5 p exported.
    expect(d.solarExportForgonePence).toBeCloseTo(22.5, 9);
    // Heat in: 1.5 + 0.5 from the element plus the heat pump's share of the balance.
    expect(d.heatInKWh).toBeCloseTo(d.heatPumpHeatKWh + 2, 9);
    expect(res.body.totals.solarHeatKWh).toBeCloseTo(1.5, 9);
    expect(res.body.totals.solarExportForgonePence).toBeCloseTo(22.5, 9);
  });
});
