import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { localMinuteOfDay } from '../../../src/lib/energy';
import { closeTestDb, query } from '../../support/db';
import { signInAs } from '../../support/session';
import { call, dropTanks, makeTank, setHomeTariff, setLatest, type EnergyTank } from './fixtures';

let tank: EnergyTank;
let bare: EnergyTank;
const cookies: Record<string, string> = {};
const NIGHT_START = 30;
const NIGHT_END = 330;
const isNight = (ms: number) => {
  const m = localMinuteOfDay(ms, 'Europe/London');
  return m >= NIGHT_START && m < NIGHT_END;
};

beforeAll(async () => {
  tank = await makeTank('kestrel-vale');
  // A cheap night from 00:30 to 05:30 (8 p/kWh) and a dear day (30 p/kWh): test values.
  await setHomeTariff(tank, {
    kind: 'day_night',
    timeZone: 'Europe/London',
    nightStartMin: NIGHT_START,
    nightEndMin: NIGHT_END,
    dayImportPence: 30,
    nightImportPence: 8,
    exportPence: 0,
    validFromMs: Date.now() - 86_400_000,
    validToMs: null,
  });
  await setLatest(tank, [40, 50, 53, 55]);
  // A tank in a company with no tariffs at all.
  bare = await makeTank('orrin-bay');
  await setLatest(bare, [40, 50, 53, 55]);
  [cookies.engineer, cookies.otherCompany] = await Promise.all([
    signInAs(process.env.TEST_BASE_URL!, 'engineer'),
    signInAs(process.env.TEST_BASE_URL!, 'operator', 'orrin-bay'),
  ]);
}, 60_000);
afterAll(async () => {
  await query('delete from commands where tank_id = any($1::uuid[])', [[tank.id, bare.id]]);
  await query('delete from tariffs where home_id = any($1::uuid[])', [[tank.homeId, bare.homeId]]);
  await dropTanks();
  await closeTestDb();
});

describe('POST /api/tanks/{id}/plan', () => {
  it('keeps V40 at or above the floor and buys its electricity in the cheap window', async () => {
    const floor = 65; // the least V40 of load profile M, Regulation (EU) No 814/2013
    const res = await call(cookies.engineer!, 'POST', `/api/tanks/${tank.id}/plan`, {
      comfortFloorL40: floor,
      hours: 48,
    });
    expect(res.status).toBe(200);
    const plan = res.body;
    expect(plan.steps).toHaveLength(96);
    expect(plan.floorMet).toBe(true);
    for (const s of plan.steps) expect(s.lowestV40).toBeGreaterThanOrEqual(floor - 1e-6);
    const night = plan.steps
      .filter((s: any) => isNight(s.startMs))
      .reduce((a: number, s: any) => a + s.electricityKWh, 0);
    const day = plan.steps
      .filter((s: any) => !isNight(s.startMs))
      .reduce((a: number, s: any) => a + s.electricityKWh, 0);
    // Load shifting into the off-peak window (common practice): most of the plan's electricity is bought at night.
    expect(night).toBeGreaterThan(0);
    expect(night).toBeGreaterThan(day);
    expect(plan.steps.every((s: any) => s.importPence === (isNight(s.startMs) ? 8 : 30))).toBe(true);
    for (const w of plan.windows ?? [])
      expect(w).toMatchObject({ from: expect.stringMatching(/^\d\d:\d\d$/), to: expect.stringMatching(/^\d\d:\d\d$/) });
  }, 60_000);

  it('refuses a floor the cylinder cannot hold, naming the field', async () => {
    const res = await call(cookies.engineer!, 'POST', `/api/tanks/${tank.id}/plan`, { comfortFloorL40: 900 });
    expect(res.status).toBe(422);
    expect(res.body.error.fields[0].field).toBe('comfortFloorL40');
  });

  it('answers 409 when no tariff prices the home', async () => {
    const res = await call(cookies.otherCompany!, 'POST', `/api/tanks/${bare.id}/plan`, {});
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('NoTariff');
  });

  it('does not plan another company’s tank', async () => {
    expect((await call(cookies.otherCompany!, 'POST', `/api/tanks/${tank.id}/plan`, {})).status).toBe(404);
  });
});

describe('POST /api/tanks/{id}/plan/send', () => {
  it('sends the plan’s windows as a set_schedule command through the command channel', async () => {
    const res = await call(cookies.engineer!, 'POST', `/api/tanks/${tank.id}/plan/send`, { comfortFloorL40: 65 });
    expect(res.status).toBe(202);
    expect(res.body.command).toMatchObject({ kind: 'set_schedule', state: 'sent' });
    const [row] = await query<{ kind: string; params: any }>('select kind, params from commands where id = $1', [
      res.body.command.id,
    ]);
    expect(row).toMatchObject({ kind: 'set_schedule', params: { windows: res.body.plan.windows } });
  }, 60_000);

  it('sends nothing for another company', async () => {
    const before = (
      await query<{ n: number }>('select count(*)::int as n from commands where tank_id = $1', [tank.id])
    )[0]!.n;
    expect((await call(cookies.otherCompany!, 'POST', `/api/tanks/${tank.id}/plan/send`, {})).status).toBe(404);
    expect(
      (await query<{ n: number }>('select count(*)::int as n from commands where tank_id = $1', [tank.id]))[0]!.n,
    ).toBe(before);
  });
});
