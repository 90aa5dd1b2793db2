// What the broker process `npm test` starts (scripts/broker.ts) refuses to hold: a packet over the
// contract's size, and a second live connection for one tank.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import mqtt, { type MqttClient } from 'mqtt';
import type pg from 'pg';
import { limits, topicFor } from '../../../src/lib/telemetry/wire';
import {
  clearTelemetry,
  connectDevice,
  count,
  eventually,
  mqttUrl,
  publishReading,
  reading,
  readingCount,
  tankWithToken,
  testPg,
  type TestTank,
} from './helpers';

const MIN = 60_000;

const closed = (c: MqttClient) =>
  new Promise<void>((resolve) => {
    if (c.disconnected || !c.connected) resolve();
    else c.once('close', () => resolve());
  });
/** Resolves with 'closed' or 'acknowledged', whichever comes first (or 'neither' after `ms`). */
async function outcome(
  c: MqttClient,
  publish: Promise<unknown>,
  ms = 10_000,
): Promise<'closed' | 'acknowledged' | 'neither'> {
  return Promise.race([
    publish.then(
      () => 'acknowledged' as const,
      () => 'closed' as const,
    ),
    closed(c).then(() => 'closed' as const),
    new Promise<'neither'>((r) => setTimeout(() => r('neither'), ms)),
  ]);
}

describe('broker limits', () => {
  let db: pg.Pool;
  let big: TestTank;
  let twice: TestTank;

  beforeAll(async () => {
    db = testPg();
    [big, twice] = [await tankWithToken(db, 215), await tankWithToken(db, 216)];
    await clearTelemetry(db, [big.id, twice.id]);
  });
  afterAll(async () => {
    await db?.end();
  });

  const deadLetters = (tankId: string) =>
    count(db, `select count(*) as n from dead_letters where tank_id = $1`, [tankId]);

  it('closes the connection of a publish over the packet limit, unacknowledged and never stored', async () => {
    const dev = await connectDevice(mqttUrl(), big);
    dev.on('error', () => undefined);
    // A valid reading padded with JSON whitespace to 2 MiB: were it let through, the worker would
    // store it or keep it as a dead letter (PayloadTooLarge).
    const r = JSON.stringify(reading(big, Date.now() - 5 * MIN));
    const payload = `${r.slice(0, -1) + ' '.repeat(2 * limits.maxPayloadBytes)}}`;
    const result = await outcome(dev, dev.publishAsync(topicFor(big.serial, 'telemetry'), payload, { qos: 1 }));
    dev.end(true);
    expect(result).toBe('closed');
    // Nothing reached the ingest worker: the next reading on a new connection is stored, and the big one left no trace.
    const again = await connectDevice(mqttUrl(), big);
    await publishReading(again, big.serial, reading(big, Date.now() - 4 * MIN));
    await again.endAsync();
    await eventually(
      () => readingCount(db, big.id),
      (n) => n >= 1,
      15_000,
      'the ordinary reading to be stored',
    );
    expect(await readingCount(db, big.id)).toBe(1);
    expect(await deadLetters(big.id)).toBe(0);
  });

  it("takes a publish of the contract's full 1 MiB payload", async () => {
    const dev = await connectDevice(mqttUrl(), big);
    const ts = Date.now() - 3 * MIN;
    const r = JSON.stringify(reading(big, ts));
    const payload = `${r.slice(0, -1) + ' '.repeat(limits.maxPayloadBytes - r.length)}}`;
    expect(Buffer.byteLength(payload)).toBe(limits.maxPayloadBytes);
    expect(await outcome(dev, dev.publishAsync(topicFor(big.serial, 'telemetry'), payload, { qos: 1 }))).toBe(
      'acknowledged',
    );
    await dev.endAsync();
    await eventually(
      () => count(db, `select count(*) as n from readings where tank_id = $1 and ts = $2`, [big.id, new Date(ts)]),
      (n) => n === 1,
      15_000,
      'the 1 MiB reading to be stored',
    );
  });

  it('keeps one live connection per tank: a new login takes over, with the same or another client id', async () => {
    const first = await connectDevice(mqttUrl(), twice, { clientId: `${twice.serial}-a`, clean: false });
    first.on('error', () => undefined);
    await first.subscribeAsync(topicFor(twice.serial, 'commands'), { qos: 1 });
    const firstClosed = closed(first);
    // A controller that rebooted under another client id (the contract allows `<serial>-…`).
    const second = await connectDevice(mqttUrl(), twice, { clientId: `${twice.serial}-b` });
    await Promise.race([
      firstClosed,
      new Promise((_, reject) => setTimeout(() => reject(new Error('the first connection was not closed')), 5000)),
    ]);
    expect(first.connected).toBe(false);
    expect(second.connected).toBe(true);
    // And the same client id again (MQTT 3.1.1 §3.1.4: the server disconnects the existing client).
    second.on('error', () => undefined);
    const secondClosed = closed(second);
    const third = await connectDevice(mqttUrl(), twice, { clientId: `${twice.serial}-b` });
    await Promise.race([
      secondClosed,
      new Promise((_, reject) => setTimeout(() => reject(new Error('the second connection was not closed')), 5000)),
    ]);
    expect(third.connected).toBe(true);
    // The tank that took over still publishes.
    await publishReading(third, twice.serial, reading(twice, Date.now() - 2 * MIN));
    await eventually(
      () => readingCount(db, twice.id),
      (n) => n === 1,
      15_000,
      'the reading of the connection that took over',
    );
    // And stays connected: the displaced clients do not come back and push it out in turn.
    await new Promise((r) => setTimeout(r, 500));
    expect(third.connected).toBe(true);
    await third.endAsync();
    // The displaced client id's session was forgotten (commands no longer queue for it): it comes back without one.
    const back = mqtt.connect(mqttUrl(), {
      clientId: `${twice.serial}-a`,
      username: twice.serial,
      password: twice.token,
      protocolVersion: 4,
      clean: false,
      reconnectPeriod: 0,
    });
    const connack = await new Promise<{ sessionPresent: boolean }>((resolve, reject) => {
      back.once('connect', resolve);
      back.once('error', reject);
    });
    await back.endAsync();
    expect(connack.sessionPresent).toBe(false);
  });
});
