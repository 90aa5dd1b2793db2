// Shared set-up of the telemetry integration tests: seeded tanks given fresh device tokens,
// MQTT device clients, readings, polling the real database.
import mqtt, { type MqttClient } from 'mqtt';
import pg from 'pg';
import { demoTanks, type DemoTank } from '../../../src/lib/demo/scenario';
import { generateDeviceToken, hashDeviceToken } from '../../../src/lib/telemetry/device-token';
import { topicFor, type ReadingInput } from '../../../src/lib/telemetry/wire';

export interface TestTank {
  id: string;
  serial: string;
  sensorCount: number;
  volumeL: number;
  targetC: number;
  token: string;
  demo: DemoTank;
}

export function testPg(url = process.env.DATABASE_URL): pg.Pool {
  if (!url) throw new Error('DATABASE_URL is not set: run the integration tests through `npm test`.');
  return new pg.Pool({ connectionString: url, max: 3 });
}

export const mqttUrl = (): string => `mqtt://127.0.0.1:${process.env.MQTT_PORT}`;

/** Kestrel Vale demo tank number `index`, with a new device token (only its hash stored). */
export async function tankWithToken(db: pg.Pool, index: number): Promise<TestTank> {
  const demo = demoTanks().filter((t) => t.companySlug === 'kestrel-vale')[index];
  const token = generateDeviceToken();
  const { rows } = await db.query(
    `update tanks set device_token_hash = $2 where serial = $1 returning id, serial, sensor_count, volume_l, target_c`,
    [demo.serial, hashDeviceToken(token)],
  );
  if (!rows[0]) throw new Error(`Demo tank ${demo.serial} is not in the database.`);
  return {
    id: rows[0].id,
    serial: rows[0].serial,
    sensorCount: rows[0].sensor_count,
    volumeL: rows[0].volume_l,
    targetC: rows[0].target_c,
    token,
    demo,
  };
}

export function connectDevice(
  url: string,
  tank: { serial: string; token: string },
  extra: mqtt.IClientOptions = {},
): Promise<MqttClient> {
  return mqtt.connectAsync(url, {
    clientId: tank.serial,
    username: tank.serial,
    password: tank.token,
    protocolVersion: 4,
    reconnectPeriod: 0,
    connectTimeout: 5000,
    ...extra,
  });
}

/** A plausible reading of `tank` at `ts` (epoch ms): a stratified column, top hottest. */
export function reading(tank: { sensorCount: number }, ts: number, over: Partial<ReadingInput> = {}): ReadingInput {
  return {
    ts,
    layersC: Array.from(
      { length: tank.sensorCount },
      (_, i) => Math.round((15 + (40 * i) / (tank.sensorCount - 1)) * 100) / 100,
    ),
    ...over,
  };
}

export const publishReading = (c: MqttClient, serial: string, body: unknown) =>
  c.publishAsync(topicFor(serial, 'telemetry'), typeof body === 'string' ? body : JSON.stringify(body), { qos: 1 });

export { eventually } from '../../support/eventually';

export async function count(db: pg.Pool, sql: string, params: unknown[]): Promise<number> {
  const { rows } = await db.query(sql, params);
  return Number(rows[0].n);
}

export const readingCount = (db: pg.Pool, tankId: string) =>
  count(db, `select count(*) as n from readings where tank_id = $1`, [tankId]);

/** Clears what earlier runs of a test stored for these tanks (the database is shared within a run). */
export async function clearTelemetry(db: pg.Pool, tankIds: string[]): Promise<void> {
  for (const t of ['readings', 'telemetry_events', 'dead_letters', 'tank_latest_state', 'commands']) {
    await db.query(`delete from ${t} where tank_id = any($1::uuid[])`, [tankIds]);
  }
}

/** A free TCP port in this run's block (HEATLAYER_TEST_PORT_BASE + offset). */
export const portInBlock = (offset: number): number => Number(process.env.PG_PORT) + offset;
