// A command reaches a simulated tank (the simulator's own device and tank model, in this process)
// through the running broker; the tank replies, obeys, and the next readings show it.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type pg from 'pg';
import { baseUrl } from '../../support/browser';
import { signInAs } from '../../support/session';
import { SimDevice } from '../../../simulator/device';
import { SimTank } from '../../../simulator/sim-tank';
import { clearTelemetry, eventually, mqttUrl, tankWithToken, testPg, type TestTank } from './helpers';

const MIN = 60_000;

describe('commands back to the tank', () => {
  let db: pg.Pool;
  let tank: TestTank;
  let sim: SimTank;
  let device: SimDevice;
  let cookie: string;
  let now = Math.floor(Date.now() / MIN) * MIN - 60 * MIN;

  beforeAll(async () => {
    db = testPg();
    tank = await tankWithToken(db, 190);
    await clearTelemetry(db, [tank.id]);
    sim = new SimTank(tank.demo, []); // no injected faults
    device = new SimDevice(sim, { mqttUrl: mqttUrl(), token: tank.token, now: () => now });
    await device.connect();
    cookie = await signInAs(baseUrl(), 'engineer');
  });
  afterAll(async () => {
    await device?.close();
    await db?.end();
  });

  const minutes = async (n: number) => {
    for (let i = 0; i < n; i++) {
      now += MIN;
      await device.send(sim.step(now));
    }
  };
  const send = async (body: unknown) => {
    const res = await fetch(`${baseUrl()}/api/tanks/${tank.id}/commands`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', origin: baseUrl(), cookie },
      body: JSON.stringify(body),
    });
    expect(res.status).toBe(202);
    return (await res.json()).command.id as string;
  };
  const stateOf = (id: string) =>
    db.query(`select state from commands where id = $1`, [id]).then((r) => r.rows[0]?.state as string);

  it('boost: acknowledged, applied, and the element shows in the next readings', async () => {
    await minutes(5);
    const before = await db.query(
      `select count(*) filter (where immersion_w > 0)::int as on from readings where tank_id = $1`,
      [tank.id],
    );
    expect(before.rows[0].on).toBe(0);
    const id = await send({ kind: 'boost', minutes: 30 });
    await eventually(
      () => stateOf(id),
      (s) => s === 'applied',
      15_000,
      'the boost to be applied',
    );
    const row = await db.query(`select acknowledged_at, applied_at from commands where id = $1`, [id]);
    expect(row.rows[0].acknowledged_at).not.toBeNull();
    await minutes(5);
    const after = await eventually(
      () =>
        db
          .query(
            `select count(*) filter (where immersion_w > 0)::int as on, max(layers_cc[array_length(layers_cc, 1)]) as top from readings where tank_id = $1 and ts > $2`,
            [tank.id, new Date(now - 5 * MIN)],
          )
          .then((r) => r.rows[0]),
      (r) => r.on >= 4,
      15_000,
      'readings with the element on',
    );
    expect(after.on).toBeGreaterThanOrEqual(4);
    const run = await db.query(
      `select count(*)::int as n from telemetry_events where tank_id = $1 and kind = 'immersion_run'`,
      [tank.id],
    );
    expect(run.rows[0].n).toBeGreaterThanOrEqual(1);
  });

  it('set_target: the tank takes the new target and its record follows', async () => {
    const id = await send({ kind: 'set_target', targetC: 60 });
    await eventually(
      () => stateOf(id),
      (s) => s === 'applied',
      15_000,
      'the new target to be applied',
    );
    expect(sim.targetC).toBe(60);
    const t = await db.query(`select target_c from tanks where id = $1`, [tank.id]);
    expect(t.rows[0].target_c).toBe(60);
  });
});
