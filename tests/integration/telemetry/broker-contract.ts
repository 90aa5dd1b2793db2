// The MQTT ingest contract, run against each broker: Heatlayer's aedes broker (the processes
// `npm test` starts) and Debian's Mosquitto (started by its own test file). Same worker code,
// same assertions: a standard MQTT 3.1.1 broker can stand in for ours.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import mqtt from 'mqtt';
import type pg from 'pg';
import { SERVICE_USERNAME } from '../../../src/lib/telemetry/device-token';
import { compressorCycles } from '../../../src/lib/thermal';
import { deriveEvents, emptyDeriveState } from '../../../src/lib/telemetry/events';
import { limits, topicFor } from '../../../src/lib/telemetry/wire';
import {
  clearTelemetry,
  connectDevice,
  count,
  eventually,
  publishReading,
  reading,
  readingCount,
  tankWithToken,
  testPg,
  type TestTank,
} from './helpers';

export interface BrokerUnderTest {
  url: string;
  /** Password of the service account (user SERVICE_USERNAME) on this broker. */
  servicePassword: string;
  /** Registers a device's credentials with the broker (Mosquitto's password file); aedes reads the database. */
  addDevice?(tank: TestTank): Promise<void>;
  stop(): Promise<void>;
}

const MIN = 60_000;

export function describeBrokerContract(
  name: string,
  firstTankIndex: number,
  start: () => Promise<BrokerUnderTest>,
): void {
  describe(`MQTT ingest through ${name}`, () => {
    let db: pg.Pool;
    let broker: BrokerUnderTest;
    let a: TestTank;
    let b: TestTank;
    let c: TestTank;

    beforeAll(async () => {
      db = testPg();
      [a, b, c] = [
        await tankWithToken(db, firstTankIndex),
        await tankWithToken(db, firstTankIndex + 1),
        await tankWithToken(db, firstTankIndex + 2),
      ];
      await clearTelemetry(db, [a.id, b.id, c.id]);
      broker = await start();
      for (const t of [a, b, c]) await broker.addDevice?.(t);
    });
    afterAll(async () => {
      await broker?.stop();
      await db?.end();
    });

    it('stores a published reading with its latest state, state of charge and V40', async () => {
      const dev = await connectDevice(broker.url, a);
      const ts = Math.floor(Date.now() / MIN) * MIN - 10 * MIN;
      await publishReading(dev, a.serial, reading(a, ts, { compressor: false, powerW: 0, seq: 1 }));
      await dev.endAsync();
      await eventually(
        () => readingCount(db, a.id),
        (n) => n === 1,
        15_000,
        'the reading to be stored',
      );
      const { rows } = await db.query(
        `select layers_cc, seq, extract(epoch from ts) * 1000 as ts from readings where tank_id = $1`,
        [a.id],
      );
      // Stored as centi-degrees: 15.00 °C at the bottom is 1500 (the storage format of src/db/schema/telemetry.ts).
      expect(rows[0].layers_cc[0]).toBe(1500);
      expect(rows[0].layers_cc[a.sensorCount - 1]).toBe(5500);
      expect(Number(rows[0].ts)).toBe(ts);
      const latest = await db.query(
        `select soc, v40_l, extract(epoch from ts) * 1000 as ts from tank_latest_state where tank_id = $1`,
        [a.id],
      );
      expect(Number(latest.rows[0].ts)).toBe(ts);
      expect(latest.rows[0].soc).toBeGreaterThan(0);
      expect(latest.rows[0].soc).toBeLessThan(1);
      // Some of the column is at or above 40 °C, so there is some V40 but less than the whole volume (EN 16147 V40 definition).
      expect(latest.rows[0].v40_l).toBeGreaterThan(0);
      expect(latest.rows[0].v40_l).toBeLessThan(a.volumeL);
    });

    it("refuses a device publishing on another tank's topic: nothing is stored for that tank", async () => {
      const dev = await connectDevice(broker.url, b, { reconnectPeriod: 0 });
      dev.on('error', () => undefined);
      const before = await readingCount(db, c.id);
      // aedes closes the connection; Mosquitto drops the message. Either way it must not reach the worker.
      await Promise.race([
        dev
          .publishAsync(topicFor(c.serial, 'telemetry'), JSON.stringify(reading(c, Date.now() - 5 * MIN)), { qos: 1 })
          .catch(() => undefined),
        new Promise((r) => setTimeout(r, 2000)),
      ]);
      dev.end(true);
      // Its own topic still works afterwards, which also proves the worker kept running.
      const own = await connectDevice(broker.url, b);
      await publishReading(own, b.serial, reading(b, Date.now() - 4 * MIN));
      await own.endAsync();
      await eventually(
        () => readingCount(db, b.id),
        (n) => n >= 1,
        15_000,
        "tank B's own reading",
      );
      expect(await readingCount(db, c.id)).toBe(before);
    });

    it("refuses a wrong token, and never delivers another tank's commands", async () => {
      await expect(connectDevice(broker.url, { serial: a.serial, token: 'hldt_wrong' })).rejects.toThrow();
      const snoop = await connectDevice(broker.url, a);
      const owner = await connectDevice(broker.url, b);
      const seen = { snoop: 0, owner: 0 };
      snoop.on('message', () => seen.snoop++);
      owner.on('message', () => seen.owner++);
      // aedes answers the subscription with the failure code 0x80 (MQTT 3.1.1 §3.9.3); Mosquitto
      // grants it and filters delivery through its ACL. Either way nothing may arrive.
      await snoop.subscribeAsync(topicFor(b.serial, 'commands'), { qos: 1 }).catch(() => undefined);
      await owner.subscribeAsync(topicFor(b.serial, 'commands'), { qos: 1 });
      const service = await mqtt.connectAsync(broker.url, {
        username: SERVICE_USERNAME,
        password: broker.servicePassword,
        clientId: `heatlayer-test-${Date.now()}`,
        protocolVersion: 4,
      });
      await service.publishAsync(topicFor(b.serial, 'commands'), JSON.stringify({ test: true }), { qos: 1 });
      await eventually(
        async () => seen.owner,
        (n) => n === 1,
        5000,
        'the owner to receive its command',
      );
      await new Promise((r) => setTimeout(r, 500));
      await Promise.all([snoop.endAsync(true), owner.endAsync(true), service.endAsync()]);
      expect(seen.snoop).toBe(0);
    });

    it('stores duplicates and out-of-order readings once, and derives the same events as in order', async () => {
      const dev = await connectDevice(broker.url, c);
      const t0 = Math.floor(Date.now() / MIN) * MIN - 120 * MIN;
      // 40 minutes: compressor on for minutes 5–14 and 25–29, a draw at minutes 18–20.
      const series = Array.from({ length: 40 }, (_, i) =>
        reading(c, t0 + i * MIN, {
          compressor: (i >= 5 && i < 15) || (i >= 25 && i < 30),
          powerW: (i >= 5 && i < 15) || (i >= 25 && i < 30) ? 1800 : 5,
          drawLpm: i >= 18 && i <= 20 ? 6 : 0,
          seq: i + 1,
        }),
      );
      // First the newest half, then the oldest half in reverse, then every reading again.
      const order = [...series.slice(20), ...series.slice(0, 20).reverse(), ...series];
      for (const r of order) await publishReading(dev, c.serial, r);
      await dev.endAsync();
      await eventually(
        () => count(db, `select count(*) as n from readings where tank_id = $1 and ts >= $2`, [c.id, new Date(t0)]),
        (n) => n === 40,
        20_000,
        '40 distinct readings',
      );
      // Wait until the worker has gone through all 120 messages (the last ones are duplicates).
      await new Promise((r) => setTimeout(r, 1500));
      expect(
        await count(db, `select count(*) as n from readings where tank_id = $1 and ts >= $2`, [c.id, new Date(t0)]),
      ).toBe(40);
      const latest = await db.query(
        `select extract(epoch from ts) * 1000 as ts from tank_latest_state where tank_id = $1`,
        [c.id],
      );
      expect(Number(latest.rows[0].ts)).toBe(t0 + 39 * MIN);

      const events = await db.query(
        `select kind, extract(epoch from started_at) * 1000 as s, extract(epoch from ended_at) * 1000 as e, litres
        from telemetry_events where tank_id = $1 and started_at >= $2 order by started_at, kind`,
        [c.id, new Date(t0)],
      );
      const expected = deriveEvents(
        emptyDeriveState(),
        series.map((r) => ({ ...r, ts: r.ts as number })),
      ).events.sort((x, y) => x.startedAt - y.startedAt || x.kind.localeCompare(y.kind));
      expect(events.rows.map((e) => ({ kind: e.kind, s: Number(e.s), e: e.e === null ? null : Number(e.e) }))).toEqual(
        expected.map((e) => ({ kind: e.kind, s: e.startedAt, e: e.endedAt })),
      );
      // Independent check: the thermal core's compressorCycles over the same on/off samples.
      const cycles = compressorCycles(series.map((r) => ({ t: r.ts as number, on: r.compressor === true })));
      const runs = events.rows.filter((e) => e.kind === 'compressor_run');
      expect(runs.map((e) => [Number(e.s), Number(e.e)])).toEqual(cycles.runs.map((r) => [r.start, r.end]));
      // Three minutes at 6 l/min is 18 litres (6 × 3; common practice arithmetic).
      expect(events.rows.find((e) => e.kind === 'draw')?.litres).toBeCloseTo(18, 5);
    });

    it('dead-letters each bad payload with its reason, and keeps the good readings of a mixed batch', async () => {
      const now = Date.now();
      const good = (dt: number) => reading(a, now - dt * MIN);
      const layers = (n: number) => Array.from({ length: n }, () => 40);
      // Each case: payload, expected reason code, the field named (where there is one).
      const cases: [string, unknown, string, string | null][] = [
        ['invalid JSON', '{"ts": 1, "layersC": [', 'InvalidJson', '(body)'],
        ['NaN (not JSON)', `{"ts": ${now}, "layersC": [NaN]}`, 'InvalidJson', '(body)'],
        ['an array', '[1,2,3]', 'InvalidEnvelope', '(body)'],
        ['missing layersC', { ts: now - MIN }, 'InvalidReading', 'layersC'],
        ['missing ts', { layersC: layers(a.sensorCount) }, 'InvalidReading', 'ts'],
        ['layers of the wrong type', { ts: now - MIN, layersC: 'hot' }, 'InvalidReading', 'layersC'],
        [
          'a string "NaN" layer',
          { ts: now - MIN, layersC: ['NaN', ...layers(a.sensorCount - 1)] },
          'InvalidReading',
          'layersC[0]',
        ],
        ['compressor not a boolean', { ...good(2), compressor: 'yes' }, 'InvalidReading', 'compressor'],
        // Above the 105 °C plausibility bound (relief valves open at about 90–95 °C, from memory) and below −10 °C (common practice).
        [
          'an absurd hot layer',
          { ts: now - MIN, layersC: [...layers(a.sensorCount - 1), 150] },
          'InvalidReading',
          `layersC[${a.sensorCount - 1}]`,
        ],
        [
          'an absurd cold layer',
          { ts: now - MIN, layersC: [-60, ...layers(a.sensorCount - 1)] },
          'InvalidReading',
          'layersC[0]',
        ],
        [
          'more layers than the tank has sensors',
          { ts: now - MIN, layersC: layers(a.sensorCount + 4) },
          'LayerCountMismatch',
          'layersC',
        ],
        ['more than 64 layers', { ts: now - MIN, layersC: layers(65) }, 'InvalidReading', 'layersC'],
        ['a timestamp an hour ahead', good(-60), 'TimestampInFuture', 'ts'],
        ['a timestamp past retention', good(400 * 1440), 'TimestampTooOld', 'ts'],
        ['epoch seconds', { ...good(1), ts: Math.floor(now / 1000) }, 'InvalidReading', 'ts'],
        ['an empty batch', { readings: [] }, 'InvalidEnvelope', 'readings'],
        [
          'an oversized batch',
          { readings: Array.from({ length: limits.maxBatch + 1 }, (_, i) => good(3000 - i)) },
          'BatchTooLarge',
          'readings',
        ],
      ];
      await db.query(`delete from dead_letters where tank_id = $1`, [a.id]);
      const dev = await connectDevice(broker.url, a);
      for (const [, payload] of cases) await publishReading(dev, a.serial, payload);
      // A batch of three with a bad middle reading: the other two are stored.
      const mixedTs = [now - 30 * MIN, now - 29 * MIN];
      await publishReading(dev, a.serial, {
        readings: [reading(a, mixedTs[0]), { ts: now - 28 * MIN, layersC: [999] }, reading(a, mixedTs[1])],
      });
      await dev.endAsync();

      const letters = await eventually(
        () =>
          db
            .query(
              `select reason_code, fields, convert_from(payload, 'UTF8') as payload from dead_letters where tank_id = $1 order by id`,
              [a.id],
            )
            .then((r) => r.rows),
        (rows) => rows.length >= cases.length + 1,
        20_000,
        'a dead letter for every bad payload',
      );
      expect(letters).toHaveLength(cases.length + 1);
      cases.forEach(([what, payload, code, field], i) => {
        expect({ what, code: letters[i].reason_code }).toEqual({ what, code });
        if (field)
          expect({ what, fields: letters[i].fields.map((f: { field: string }) => f.field) }).toEqual({
            what,
            fields: expect.arrayContaining([field]),
          });
        // The raw payload is kept as it arrived.
        expect(letters[i].payload).toBe(typeof payload === 'string' ? payload : JSON.stringify(payload));
      });
      expect(letters[cases.length].reason_code).toBe('InvalidReading');
      expect(letters[cases.length].fields[0].field).toBe('readings[1].layersC[0]');
      const stored = await count(
        db,
        `select count(*) as n from readings where tank_id = $1 and ts = any($2::timestamptz[])`,
        [a.id, mixedTs.map((t) => new Date(t))],
      );
      expect(stored).toBe(2);
    });
  });
}
