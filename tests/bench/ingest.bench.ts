// `npm run bench:ingest`: throughput and latency of the telemetry pipeline on one database, beside
// naive baselines of the same work. Prints figures and ratios; asserts nothing (shared machines).
//   (a) MQTT end to end: publishers → broker (its own process) → ingest worker → committed with
//       latest state and events, vs. broker → one subscriber → JSON.parse → COPY in 1000s.
//   (b) HTTP batch ingest, 1000 readings a request, vs. a raw COPY of the same rows.
//   (c) p99 delay from publish to committed at 80 % of the rate measured in (a).
// Ports: HEATLAYER_BENCH_PORT_BASE … +3, by default offsets 80–83 of the test port block (scripts/lib/ports.ts).
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { availableParallelism, loadavg } from 'node:os';
import { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import mqtt, { type MqttClient } from 'mqtt';
import pg from 'pg';
import { from as copyFrom } from 'pg-copy-streams';
import { ensureBuild } from '../../scripts/lib/build';
import { startPostgres, stopPostgres } from '../../scripts/lib/postgres';
import { testPortBase } from '../../scripts/lib/ports';
import { httpOk, waitFor } from '../../scripts/lib/processes';
import {
  generateDeviceToken,
  hashDeviceToken,
  SERVICE_USERNAME,
  servicePassword,
} from '../../src/lib/telemetry/device-token';
import type { IngestWorker as IngestWorkerType } from '../../src/lib/telemetry/ingest-worker.server';
import { brokerAcceptsService } from '../../src/lib/telemetry/probes';
import { topicFor } from '../../src/lib/telemetry/wire';

const base = Number(process.env.HEATLAYER_BENCH_PORT_BASE ?? testPortBase() + 80);
const root = new URL('../..', import.meta.url).pathname;
const PUBLISHERS = Number(process.env.BENCH_PUBLISHERS ?? 500);
const MESSAGES_EACH = Number(process.env.BENCH_MESSAGES ?? 40);
const HTTP_REQUESTS = Number(process.env.BENCH_HTTP_REQUESTS ?? 200);
/** Untimed requests first, so that (b) measures the warmed-up server rather than its first JIT compilations. */
const HTTP_WARMUP = 10;
const SENSORS = 12;
const MIN = 60_000;

interface BenchTank {
  id: string;
  serial: string;
  token: string;
}
const fmt = (n: number) => Math.round(n).toLocaleString('en-GB');
const layers = (i: number) =>
  Array.from({ length: SENSORS }, (_, k) => Math.round((15 + k * 3.5 + (i % 7) * 0.1) * 100) / 100);

async function createTanks(db: pg.Pool, companyId: string, prefix: string, n: number): Promise<BenchTank[]> {
  const tanks: BenchTank[] = [];
  for (let i = 0; i < n; i++)
    tanks.push({ id: '', serial: `${prefix}-${String(i).padStart(5, '0')}`, token: generateDeviceToken() });
  const rows = await db.query<{ id: string; serial: string }>(
    `
    insert into tanks (company_id, serial, model, volume_l, height_m, sensor_count, heat_source, hp_output_w, target_c, device_token_hash)
    select $1, s, 'C210 cylinder', 210, 1.4, ${SENSORS}, 'hp_plate', 6000, 55, h from unnest($2::text[], $3::text[]) as x(s, h)
    returning id, serial`,
    [companyId, tanks.map((t) => t.serial), tanks.map((t) => hashDeviceToken(t.token))],
  );
  const ids = new Map(rows.rows.map((r) => [r.serial, r.id]));
  for (const t of tanks) t.id = ids.get(t.serial)!;
  return tanks;
}

/** One client per tank: as the tank itself, or (the naive run) as the service account. */
async function connectAll(url: string, tanks: BenchTank[], asService?: string): Promise<MqttClient[]> {
  const out: MqttClient[] = [];
  const opts = (t: BenchTank) =>
    asService
      ? { clientId: `heatlayer-bench-${t.serial}`, username: SERVICE_USERNAME, password: asService }
      : { clientId: t.serial, username: t.serial, password: t.token };
  for (let i = 0; i < tanks.length; i += 50) {
    out.push(
      ...(await Promise.all(
        tanks
          .slice(i, i + 50)
          .map((t) => mqtt.connectAsync(url, { ...opts(t), protocolVersion: 4, reconnectPeriod: 0 })),
      )),
    );
  }
  return out;
}

/** The naive run publishes where the ingest worker does not listen, so the two never share work. */
const naiveTopic = (serial: string) => `heatlayer/v1/bench/${serial}`;

/** Every publisher sends `each` single readings, all at once (QoS 1); resolves when all are acknowledged by the broker. */
async function publishBurst(
  clients: MqttClient[],
  tanks: BenchTank[],
  each: number,
  t0: number,
  topic: (serial: string) => string,
): Promise<void> {
  await Promise.all(
    clients.map(async (c, k) => {
      const pend: Promise<unknown>[] = [];
      for (let i = 0; i < each; i++) {
        pend.push(
          c.publishAsync(
            topic(tanks[k].serial),
            JSON.stringify({ ts: t0 + i * MIN, layersC: layers(i), compressor: i % 10 < 3, powerW: 1500, seq: i + 1 }),
            { qos: 1 },
          ),
        );
      }
      await Promise.all(pend);
    }),
  );
}

async function countReadings(db: pg.Pool, ids: string[]): Promise<number> {
  return Number(
    (await db.query(`select count(*) as n from readings where tank_id = any($1::uuid[])`, [ids])).rows[0].n,
  );
}

async function until(probe: () => Promise<boolean>, timeoutMs = 300_000): Promise<void> {
  const end = Date.now() + timeoutMs;
  while (Date.now() < end) {
    if (await probe()) return;
    await new Promise((r) => setTimeout(r, 25));
  }
  throw new Error('Timed out.');
}

/** The naive pipeline: one subscriber, JSON.parse, COPY 1000 rows at a time, no validation, no state. */
function naiveSubscriber(url: string, password: string, db: pg.Pool, ids: Map<string, string>): Promise<MqttClient> {
  let rows: string[] = [];
  let busy = Promise.resolve();
  const flush = () => {
    const batch = rows;
    rows = [];
    busy = busy.then(async () => {
      const c = await db.connect();
      try {
        await pipeline(
          Readable.from([batch.join('')]),
          c.query(copyFrom('copy readings (tank_id, ts, seq, layers_cc, compressor, power_w) from stdin')),
        );
      } finally {
        c.release();
      }
    });
  };
  return mqtt
    .connectAsync(url, { username: SERVICE_USERNAME, password, clientId: 'heatlayer-bench-naive', protocolVersion: 4 })
    .then(async (c) => {
      c.on('message', (topic, payload) => {
        const r = JSON.parse(payload.toString());
        const serial = topic.split('/')[3];
        rows.push(
          `${ids.get(serial)}\t${new Date(r.ts).toISOString()}\t${r.seq}\t{${r.layersC.map((x: number) => Math.round(x * 100)).join(',')}}\t${r.compressor ? 't' : 'f'}\t${r.powerW}\n`,
        );
        if (rows.length >= 1000) flush();
      });
      setInterval(() => {
        if (rows.length) flush();
      }, 50).unref();
      await c.subscribeAsync(naiveTopic('+'), { qos: 1 });
      return c;
    });
}

async function main(): Promise<void> {
  const pgPort = base;
  const mqttPort = base + 2;
  const webPort = base + 1;
  const ingestPort = base + 4;
  const dataDir = `/tmp/heatlayer-pg-bench-${pgPort}`;
  console.log(
    `[bench] PostgreSQL on ${pgPort}, broker on ${mqttPort}, web on ${webPort}; ${PUBLISHERS} publishers × ${MESSAGES_EACH} readings`,
  );
  const server = await startPostgres({ port: pgPort, dataDir, fresh: true });
  const env: Record<string, string> = {
    ...(process.env as Record<string, string>),
    DATABASE_URL: server.url,
    MQTT_PORT: String(mqttPort),
    PORT: String(webPort),
    INGEST_PORT: String(ingestPort),
    HOST: '127.0.0.1',
    AUTH_SECRET: randomBytes(32).toString('base64url'),
    NODE_ENV: 'production',
    AUTH_URL: `http://localhost:${webPort}`,
    AUTH_TRUST_HOST: 'true',
    HEATLAYER_DATA_DIR: `/tmp/heatlayer-bench-${base}`,
  };
  Object.assign(process.env, env);
  const children: ChildProcess[] = [];
  try {
    const mig = spawnSync(process.execPath, ['--import', 'tsx', 'scripts/migrate.ts'], {
      cwd: root,
      env,
      encoding: 'utf8',
    });
    if (mig.status !== 0) throw new Error(mig.stderr);
    // Daily partitions over the whole retention window, as the ingest worker makes them at start:
    // (b) writes readings 80 days old.
    const { setReadingsRetention } = await import('../../src/db/queries/rollups');
    await setReadingsRetention(90);
    const db = new pg.Pool({ connectionString: server.url, max: 6 });
    const company = (
      await db.query(
        `insert into companies (slug, name, email_domain) values ('bench', 'Bench Co-operative', 'bench.example.com') returning id`,
      )
    ).rows[0].id;
    const [naiveTanks, fullTanks, latTanks, httpTanks, copyTanks] = [
      await createTanks(db, company, 'BN', PUBLISHERS),
      await createTanks(db, company, 'BF', PUBLISHERS),
      await createTanks(db, company, 'BL', PUBLISHERS),
      await createTanks(db, company, 'BH', 4),
      await createTanks(db, company, 'BC', 4),
    ];
    const broker = spawn(process.execPath, ['--import', 'tsx', 'scripts/broker.ts'], {
      cwd: root,
      env,
      stdio: ['ignore', 'ignore', 'inherit'],
    });
    children.push(broker);
    const url = `mqtt://127.0.0.1:${mqttPort}`;
    const password = servicePassword(env);
    await waitFor('broker', () => brokerAcceptsService(url, password));
    const t0 = Date.now() - (MESSAGES_EACH + 10) * MIN;
    const total = PUBLISHERS * MESSAGES_EACH;

    // (a) naive baseline. The broker admits tanks only once an ingest session exists, so start the worker first.
    const { IngestWorker } = await import('../../src/lib/telemetry/ingest-worker.server');
    const { getPool } = await import('../../src/db');
    const worker: IngestWorkerType = new IngestWorker({
      mqttUrl: url,
      username: SERVICE_USERNAME,
      password,
      pool: getPool(),
      retentionDays: 90,
      log: () => undefined,
    });
    await new Promise<void>((resolve) => {
      worker.once('ready', () => resolve());
      worker.start();
    });
    const naive = await naiveSubscriber(url, password, db, new Map(naiveTanks.map((t) => [t.serial, t.id])));
    let clients = await connectAll(url, naiveTanks, password);
    let start = performance.now();
    await publishBurst(clients, naiveTanks, MESSAGES_EACH, t0, naiveTopic);
    await until(
      async () =>
        (await countReadings(
          db,
          naiveTanks.map((t) => t.id),
        )) >= total,
    );
    const naiveRate = total / ((performance.now() - start) / 1000);
    await naive.endAsync();
    await Promise.all(clients.map((c) => c.endAsync()));

    // (a) the full pipeline on fresh tanks.
    clients = await connectAll(url, fullTanks);
    const before = worker.stats.inserted;
    start = performance.now();
    await publishBurst(clients, fullTanks, MESSAGES_EACH, t0, (serial) => topicFor(serial, 'telemetry'));
    await until(async () => worker.stats.inserted - before >= total);
    const fullRate = total / ((performance.now() - start) / 1000);
    await Promise.all(clients.map((c) => c.endAsync()));
    const events = Number(
      (
        await db.query(`select count(*) as n from telemetry_events where tank_id = any($1::uuid[])`, [
          fullTanks.map((t) => t.id),
        ])
      ).rows[0].n,
    );
    const latest = Number(
      (
        await db.query(`select count(*) as n from tank_latest_state where tank_id = any($1::uuid[])`, [
          fullTanks.map((t) => t.id),
        ])
      ).rows[0].n,
    );

    // (c) latency at 80 % of the sustained rate.
    const publishedAt = new Map<string, number>();
    const delays: number[] = [];
    worker.on('committed', (info: { topics: string[]; payloads: Buffer[] }) => {
      const now = performance.now();
      info.payloads.forEach((p, i) => {
        const key = `${info.topics[i].split('/')[3]}|${JSON.parse(p.toString()).seq}`;
        const at = publishedAt.get(key);
        if (at !== undefined) delays.push(now - at);
      });
    });
    clients = await connectAll(url, latTanks);
    const rate = 0.8 * fullRate;
    const latTotal = Math.min(PUBLISHERS * MESSAGES_EACH, Math.round(rate * 10));
    const perClient = Math.ceil(latTotal / clients.length);
    const tickMs = 20;
    const perTick = Math.max(1, Math.round((rate * tickMs) / 1000));
    let sent = 0;
    const seqs = new Array(clients.length).fill(0);
    await new Promise<void>((resolve) => {
      const timer = setInterval(() => {
        for (let j = 0; j < perTick && sent < perClient * clients.length; j++, sent++) {
          const k = sent % clients.length;
          const seq = ++seqs[k];
          publishedAt.set(`${latTanks[k].serial}|${seq}`, performance.now());
          void clients[k].publishAsync(
            topicFor(latTanks[k].serial, 'telemetry'),
            JSON.stringify({ ts: t0 + seq * MIN, layersC: layers(seq), compressor: false, powerW: 5, seq }),
            { qos: 1 },
          );
        }
        if (sent >= perClient * clients.length) {
          clearInterval(timer);
          resolve();
        }
      }, tickMs);
    });
    await until(async () => delays.length >= sent);
    await Promise.all(clients.map((c) => c.endAsync()));
    delays.sort((x, y) => x - y);
    const pct = (q: number) => delays[Math.min(delays.length - 1, Math.floor(q * delays.length))];

    // (b) HTTP batches of 1000 posted to the ingest tier's listener, as gateways post to the ingest
    // worker's (here it runs in this process), vs raw COPY of the same rows; meanwhile a page of the
    // built web server is timed, against the same page idle.
    const { listenForIngest } = await import('../../src/lib/telemetry/ingest-listener.server');
    (await listenForIngest('127.0.0.1', ingestPort)).unref();
    ensureBuild();
    const web = spawn(process.execPath, ['dist/server/entry.mjs'], {
      cwd: root,
      env,
      stdio: ['ignore', 'ignore', 'inherit'],
    });
    children.push(web);
    await waitFor('web', () => httpOk(`http://127.0.0.1:${webPort}/api/health`));
    const batches = (_tank: BenchTank, k: number) =>
      JSON.stringify({
        readings: Array.from({ length: 1000 }, (_, i) => ({
          ts: Date.now() - 80 * 86_400_000 + (k * 1000 + i) * MIN,
          layersC: layers(i),
          compressor: i % 10 < 3,
          powerW: 1500,
          seq: k * 1000 + i,
        })),
      });
    const bodies = Array.from({ length: HTTP_WARMUP + HTTP_REQUESTS }, (_, k) => ({
      tank: httpTanks[k % httpTanks.length],
      body: batches(httpTanks[k % httpTanks.length], Math.floor(k / httpTanks.length)),
    }));
    const send = async (list: typeof bodies, concurrency: number) => {
      let next = 0;
      await Promise.all(
        Array.from({ length: concurrency }, async () => {
          while (next < list.length) {
            const b = list[next++];
            const res = await fetch(`http://127.0.0.1:${ingestPort}/api/ingest`, {
              method: 'POST',
              headers: { authorization: `Bearer ${b.tank.token}`, 'content-type': 'application/json' },
              body: b.body,
            });
            if (res.status !== 202) throw new Error(`HTTP ingest answered ${res.status}: ${await res.text()}`);
          }
        }),
      );
    };
    await send(bodies.slice(0, HTTP_WARMUP), 1);
    bodies.splice(0, HTTP_WARMUP);
    // A page of the web server (the sign-in page, rendered on the server) timed while idle, then
    // while the batches flood in.
    const pageMs = async (until: () => boolean, atLeast: number) => {
      const ms: number[] = [];
      while (ms.length < atLeast || !until()) {
        const t = performance.now();
        await (await fetch(`http://127.0.0.1:${webPort}/signin`)).arrayBuffer();
        ms.push(performance.now() - t);
      }
      return ms.sort((a, b) => a - b);
    };
    const q = (ms: number[], p: number) => ms[Math.min(ms.length - 1, Math.floor(p * ms.length))]!;
    const idle = await pageMs(() => true, 60);
    let flooding = true;
    start = performance.now();
    const [, busy] = await Promise.all([
      send(bodies, 2).finally(() => (flooding = false)),
      pageMs(() => !flooding, 20),
    ]);
    const httpRate = (HTTP_REQUESTS * 1000) / ((performance.now() - start) / 1000);
    const copyRows = bodies.map((b, k) =>
      JSON.parse(b.body)
        .readings.map(
          (r: { ts: number; layersC: number[]; compressor: boolean; powerW: number; seq: number }) =>
            `${copyTanks[k % copyTanks.length].id}\t${new Date(r.ts).toISOString()}\t${r.seq}\t{${r.layersC.map((x) => Math.round(x * 100)).join(',')}}\t${r.compressor ? 't' : 'f'}\t${r.powerW}\n`,
        )
        .join(''),
    );
    start = performance.now();
    const c = await db.connect();
    for (const chunk of copyRows)
      await pipeline(
        Readable.from([chunk]),
        c.query(copyFrom('copy readings (tank_id, ts, seq, layers_cc, compressor, power_w) from stdin')),
      );
    c.release();
    const copyRate = (HTTP_REQUESTS * 1000) / ((performance.now() - start) / 1000);

    // Where the time goes, measured in this process: validation alone, the writer alone (no HTTP).
    const { parseTelemetry } = await import('../../src/lib/telemetry/wire');
    const { TelemetryWriter } = await import('../../src/lib/telemetry/writer.server');
    const ctx = (t: BenchTank) => ({
      now: Date.now(),
      tank: { serial: t.serial, sensorCount: SENSORS },
      retentionDays: 90,
    });
    const single = JSON.stringify({ ts: t0, layersC: layers(3), compressor: true, powerW: 1500, seq: 1 });
    const perMessageUs = (fn: () => void) => {
      const n = 5000;
      const s0 = performance.now();
      for (let i = 0; i < n; i++) fn();
      return ((performance.now() - s0) * 1000) / n;
    };
    const validateUs = perMessageUs(() => parseTelemetry(single, ctx(latTanks[0])));
    const jsonUs = perMessageUs(() => JSON.parse(single));
    // A tank of its own, 20 batches of 1000 in time order: the writer's usual path.
    const [writeBench] = await createTanks(db, company, 'BW', 1);
    const sample = Array.from({ length: 20 }, (_, k) => batches(writeBench, k));
    start = performance.now();
    const parsedSample = sample.map((body) => parseTelemetry(body, ctx(writeBench)));
    const validateMs = (performance.now() - start) / sample.length;
    const writer = new TelemetryWriter(getPool());
    const writeTank = {
      id: writeBench.id,
      serial: writeBench.serial,
      companyId: company,
      volumeL: 210,
      sensorCount: SENSORS,
      targetC: 55,
    };
    start = performance.now();
    for (const p of parsedSample) {
      if (!p.ok) throw new Error(p.reason);
      await writer.write({ readings: p.readings.map((reading) => ({ tank: writeTank, reading })) });
    }
    const writeMs = (performance.now() - start) / parsedSample.length;
    const httpMs = (1000 * 1000) / httpRate;
    const copyMs = (1000 * 1000) / copyRate;

    console.log('');
    console.log(`(a) MQTT end to end (validated, committed, latest state and events): ${fmt(fullRate)} readings/s`);
    console.log(`    naive broker → subscriber → JSON.parse → COPY ×1000:            ${fmt(naiveRate)} readings/s`);
    console.log(
      `    ratio ${(fullRate / naiveRate).toFixed(2)} (target ≥ 0.5); ${fmt(latest)} latest-state rows, ${fmt(events)} events derived`,
    );
    console.log(`(b) HTTP ingest, 1000 readings a request:                            ${fmt(httpRate)} readings/s`);
    console.log(`    raw COPY of the same rows into the daily partitions:              ${fmt(copyRate)} readings/s`);
    console.log(`    ratio ${(httpRate / copyRate).toFixed(2)} (target ≥ 0.3)`);
    console.log(
      `    a page (GET /signin) meanwhile: p50 ${q(busy, 0.5).toFixed(0)} ms, p95 ${q(busy, 0.95).toFixed(0)} ms (${busy.length} requests); idle p50 ${q(idle, 0.5).toFixed(0)} ms, p95 ${q(idle, 0.95).toFixed(0)} ms; p95 ratio ${(q(busy, 0.95) / q(idle, 0.95)).toFixed(1)} (the ingest tier does the work; on 2 shared cores it still competes for them)`,
    );
    console.log(
      `(c) publish → committed at 80 % of (a) (${fmt(rate)} readings/s, ${fmt(delays.length)} readings): p50 ${pct(0.5).toFixed(0)} ms, p99 ${pct(0.99).toFixed(0)} ms, max ${delays[delays.length - 1].toFixed(0)} ms`,
    );
    console.log(
      `    worker: ${worker.stats.batches} batches, ${fmt(worker.stats.inserted)} stored, ${fmt(worker.stats.duplicates)} duplicates`,
    );
    console.log('What limits each (measured here, one process at a time):');
    console.log(
      `    (a) per message: validation ${validateUs.toFixed(1)} µs against JSON.parse ${jsonUs.toFixed(1)} µs; each message is its own`,
    );
    console.log(
      `        broker hop, tank lookup and QoS 1 acknowledgement after commit; the worker wrote ${fmt(worker.stats.inserted / Math.max(1, worker.stats.batches))} readings a commit.`,
    );
    console.log(
      `    (b) per 1000 readings: ${httpMs.toFixed(1)} ms through HTTP; alone, validation takes ${validateMs.toFixed(1)} ms and the writer ${writeMs.toFixed(1)} ms, of which`,
    );
    console.log(
      `        a raw COPY is ${copyMs.toFixed(1)} ms and the rest latest state, events, the rollup queue and commit. Two requests at a time`,
    );
    console.log(
      `        overlap these; the web server, PostgreSQL and this process share ${availableParallelism()} cores (load average now ${loadavg()[0].toFixed(1)}).`,
    );
    await worker.stop();
    await db.end();
    const { closeDb } = await import('../../src/db');
    await closeDb();
  } finally {
    for (const ch of children) ch.kill('SIGTERM');
    await new Promise((r) => setTimeout(r, 1000));
    stopPostgres(dataDir);
  }
}

main()
  .then(() => process.exit(0))
  .catch((err) => {
    console.error('[bench] failed:', err);
    process.exit(1);
  });
