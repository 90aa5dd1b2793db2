// PostgreSQL stopped for 10 s in the middle of a stream: the worker stops acknowledging, retries,
// and afterwards every reading is stored exactly once. It runs its own PostgreSQL (it stops it),
// broker and ingest worker processes, on ports of this run's block.
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { rmSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import pg from 'pg';
import { startPostgres, stopPostgres, type PgServer } from '../../../scripts/lib/postgres';
import { waitFor } from '../../../scripts/lib/processes';
import { demoTanks } from '../../../src/lib/demo/scenario';
import { demoDeviceToken, servicePassword } from '../../../src/lib/telemetry/device-token';
import { brokerAcceptsService, ingestWorkerOnline } from '../../../src/lib/telemetry/probes';
import { connectDevice, eventually, portInBlock, publishReading, reading } from './helpers';

const MIN = 60_000;
const root = new URL('../../..', import.meta.url).pathname;
const SEED = 'postgres-outage-test-device-seed';

describe('PostgreSQL stopped for 10 s mid-stream', () => {
  const pgPort = portInBlock(21);
  const mqttPort = portInBlock(22);
  const ingestPort = portInBlock(23);
  const dataDir = `/tmp/heatlayer-pg-test-${pgPort}`;
  let server: PgServer;
  let db: pg.Pool;
  const children: ChildProcess[] = [];
  let env: Record<string, string>;

  beforeAll(async () => {
    server = await startPostgres({ port: pgPort, dataDir, fresh: true });
    env = {
      ...(process.env as Record<string, string>),
      DATABASE_URL: server.url,
      MQTT_PORT: String(mqttPort),
      INGEST_PORT: String(ingestPort),
      DEVICE_TOKEN_SEED: SEED,
    };
    for (const script of ['scripts/migrate.ts', 'scripts/seed.ts']) {
      const r = spawnSync(process.execPath, ['--import', 'tsx', script], { cwd: root, env, encoding: 'utf8' });
      if (r.status !== 0) throw new Error(`${script} failed: ${r.stderr}`);
    }
    const url = `mqtt://127.0.0.1:${mqttPort}`;
    const password = servicePassword(env);
    for (const [script, probe] of [
      ['scripts/broker.ts', () => brokerAcceptsService(url, password)],
      ['scripts/ingest-worker.ts', () => ingestWorkerOnline(url, password)],
    ] as const) {
      const child = spawn(process.execPath, ['--import', 'tsx', script], {
        cwd: root,
        env,
        stdio: ['ignore', 'inherit', 'inherit'],
      });
      children.push(child);
      await waitFor(script, probe, 60_000);
    }
    db = new pg.Pool({ connectionString: server.url, max: 2 });
    db.on('error', () => undefined);
  }, 180_000);

  afterAll(async () => {
    await db?.end().catch(() => undefined);
    for (const c of children.reverse()) {
      const exited = new Promise((r) => c.once('exit', r));
      c.kill('SIGTERM');
      await Promise.race([exited, new Promise((r) => setTimeout(r, 6000))]);
      if (c.exitCode === null) c.kill('SIGKILL');
    }
    stopPostgres(dataDir);
    rmSync(dataDir, { recursive: true, force: true });
  }, 60_000);

  it('loses nothing and stores nothing twice', async () => {
    const demo = demoTanks()[0];
    const tank = { serial: demo.serial, token: demoDeviceToken(SEED, demo.serial), sensorCount: demo.sensorCount };
    const {
      rows: [row],
    } = await db.query(`select id from tanks where serial = $1`, [demo.serial]);
    const dev = await connectDevice(`mqtt://127.0.0.1:${mqttPort}`, tank, { clean: false, reconnectPeriod: 500 });
    dev.on('error', () => undefined);
    const N = 300;
    const t0 = Math.floor(Date.now() / MIN) * MIN - N * MIN;
    const pending: Promise<unknown>[] = [];
    let outage: Promise<void> | null = null;
    for (let i = 0; i < N; i++) {
      pending.push(publishReading(dev, tank.serial, reading(tank, t0 + i * MIN, { seq: i + 1 })));
      await new Promise((r) => setTimeout(r, 40));
      if (i === 60) {
        outage = (async () => {
          stopPostgres(dataDir);
          await new Promise((r) => setTimeout(r, 10_000));
          await startPostgres({ port: pgPort, dataDir });
        })();
      }
    }
    await outage;
    await Promise.all(pending);
    await dev.endAsync();
    const n = await eventually(
      async () => {
        try {
          return Number((await db.query(`select count(*) as n from readings where tank_id = $1`, [row.id])).rows[0].n);
        } catch {
          return -1;
        }
      },
      (v) => v >= N,
      60_000,
      `${N} readings after the outage`,
    );
    expect(n).toBe(N);
    const { rows } = await db.query(
      `select count(distinct seq)::int as seqs, min(seq) as lo, max(seq) as hi from readings where tank_id = $1`,
      [row.id],
    );
    expect(rows[0]).toEqual({ seqs: N, lo: 1, hi: N });
    const latest = await db.query(`select seq from tank_latest_state where tank_id = $1`, [row.id]);
    expect(latest.rows[0].seq).toBe(N);
  }, 120_000);
});
