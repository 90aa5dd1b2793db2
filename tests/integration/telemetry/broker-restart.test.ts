// The broker restarted in the middle of a stream: nothing lost, nothing stored twice. The test runs
// its own broker (in this process, on a port of this run's block) so the shared one stays up.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type pg from 'pg';
import { closeDb, getPool } from '../../../src/db';
import { findDeviceTokenHash } from '../../../src/db/queries/telemetry';
import { startBroker, type TelemetryBroker } from '../../../src/lib/telemetry/broker.server';
import { SERVICE_USERNAME } from '../../../src/lib/telemetry/device-token';
import { IngestWorker } from '../../../src/lib/telemetry/ingest-worker.server';
import {
  clearTelemetry,
  connectDevice,
  eventually,
  portInBlock,
  publishReading,
  reading,
  readingCount,
  tankWithToken,
  testPg,
  type TestTank,
} from './helpers';

const MIN = 60_000;
const SERVICE_PASSWORD = 'broker-restart-test-service-password';

describe('broker restarted mid-stream', () => {
  let db: pg.Pool;
  let tank: TestTank;
  let broker: TelemetryBroker;
  let worker: IngestWorker;
  const port = portInBlock(26);
  const url = `mqtt://127.0.0.1:${port}`;
  const start = () =>
    startBroker({
      port,
      servicePassword: SERVICE_PASSWORD,
      lookupTokenHash: findDeviceTokenHash,
      log: () => undefined,
    });

  beforeAll(async () => {
    db = testPg();
    tank = await tankWithToken(db, 180);
    await clearTelemetry(db, [tank.id]);
    broker = await start();
    worker = new IngestWorker({
      mqttUrl: url,
      username: SERVICE_USERNAME,
      password: SERVICE_PASSWORD,
      pool: getPool(),
      retentionDays: 90,
      log: () => undefined,
    });
    const ready = new Promise((r) => worker.once('ready', r));
    worker.start();
    await ready;
  });
  afterAll(async () => {
    await worker?.stop();
    await broker?.close({ drainMs: 0 });
    await closeDb();
    await db?.end();
  });

  it('stores every reading exactly once across a broker restart', async () => {
    const N = 400;
    const t0 = Math.floor(Date.now() / MIN) * MIN - N * MIN;
    const dev = await connectDevice(url, tank, { reconnectPeriod: 200, clean: false, reconnectOnConnackError: true });
    dev.on('error', () => undefined);
    const pending: Promise<unknown>[] = [];
    let drained: { undelivered: number } | null = null;
    for (let i = 0; i < N; i++) {
      pending.push(publishReading(dev, tank.serial, reading(tank, t0 + i * MIN, { seq: i + 1 })));
      if (i % 20 === 19) await new Promise((r) => setTimeout(r, 10));
      if (i === 150) {
        // A planned restart: the old broker waits until the worker has acknowledged everything it
        // queued, then a new one takes the port. The tank reconnects and sends again what was not
        // acknowledged; the new broker admits it once the worker has subscribed again.
        drained = await broker.close({ drainMs: 5000 });
        broker = await start();
      }
    }
    await Promise.all(pending);
    await dev.endAsync();
    await eventually(
      () => readingCount(db, tank.id),
      (n) => n >= N,
      30_000,
      `${N} readings`,
    );
    await new Promise((r) => setTimeout(r, 500));
    const { rows } = await db.query(
      `select count(*)::int as n, count(distinct seq)::int as seqs, min(seq) as lo, max(seq) as hi from readings where tank_id = $1`,
      [tank.id],
    );
    expect(rows[0]).toEqual({ n: N, seqs: N, lo: 1, hi: N });
    expect(drained?.undelivered).toBe(0);
    expect(worker.connected).toBe(true);
  }, 90_000);
});
