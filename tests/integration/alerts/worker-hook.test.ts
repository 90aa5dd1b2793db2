// The ingest worker process (started by `npm test`) runs the alert rules after each committed
// batch: readings published over MQTT by a tank with a dead sensor open a sensor-fault alert
// without anything else calling the rules; the same batch published again adds nothing.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type pg from 'pg';
import {
  clearTelemetry,
  connectDevice,
  eventually,
  mqttUrl,
  publishReading,
  reading,
  tankWithToken,
  testPg,
  type TestTank,
} from '../telemetry/helpers';

const MIN = 60_000;
let db: pg.Pool;
let tank: TestTank;

beforeAll(async () => {
  db = testPg();
  tank = await tankWithToken(db, 200);
  await clearTelemetry(db, [tank.id]);
  await db.query('delete from alerts where tank_id = $1', [tank.id]);
  await db.query('delete from alert_tank_state where tank_id = $1', [tank.id]);
});
afterAll(async () => {
  await db.query('delete from alerts where tank_id = $1', [tank.id]);
  await db.query('delete from alert_tank_state where tank_id = $1', [tank.id]);
  await clearTelemetry(db, [tank.id]);
  await db.end();
});

describe('the ingest worker', () => {
  it('opens a sensor-fault alert from readings it has just committed, once', async () => {
    const dev = await connectDevice(mqttUrl(), tank);
    const start = Math.floor(Date.now() / MIN) * MIN - 30 * MIN;
    const batch = {
      readings: Array.from({ length: 20 }, (_, i) =>
        reading(tank, start + i * MIN, { layersC: reading(tank, 0).layersC.map((t, j) => (j === 1 ? null : t)) }),
      ),
    };
    await publishReading(dev, tank.serial, batch);
    const rows = await eventually(
      async () =>
        (
          await db.query<{ kind: string; state: string; evidence: any }>(
            'select kind, state, evidence from alerts where tank_id = $1',
            [tank.id],
          )
        ).rows,
      (r) => r.length > 0,
      20_000,
      'the worker to open an alert',
    );
    expect(rows.map((r) => [r.kind, r.state])).toEqual([['sensor_fault', 'open']]);
    expect(rows[0]!.evidence.summary).toMatch(/Sensor 2 \(from the bottom\) gives no reading/);
    await publishReading(dev, tank.serial, batch);
    await new Promise((r) => setTimeout(r, 2000));
    expect((await db.query('select 1 from alerts where tank_id = $1', [tank.id])).rowCount).toBe(1);
    await dev.endAsync();
  });
});
