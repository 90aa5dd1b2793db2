// The fleet simulator against the running broker and ingest worker: when an administrator rotates
// one tank's device token, that simulated tank fails alone and says so once; the others keep
// reporting. Once it can log in again it says so once and sends what it kept.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type pg from 'pg';
import { demoTanks } from '../../../src/lib/demo/scenario';
import { demoDeviceToken, hashDeviceToken } from '../../../src/lib/telemetry/device-token';
import { Fleet } from '../../../simulator/fleet';
import { baseUrl } from '../../support/browser';
import { signInAs } from '../../support/session';
import { clearTelemetry, count, eventually, mqttUrl, readingCount, testPg } from './helpers';

const KEY = `fleet-test-${process.pid}`;
// Kestrel Vale tanks without injected faults (a network_outage fault would take one offline on purpose), clear of other tests' tanks.
const chosen = demoTanks()
  .filter((t) => t.companySlug === 'kestrel-vale')
  .slice(225)
  .filter((t) => t.faults.length === 0)
  .slice(0, 4);

describe("simulated fleet with one tank's token rotated", () => {
  let db: pg.Pool;
  let fleet: Fleet;
  const lines: string[] = [];
  const ids = new Map<string, string>();

  beforeAll(async () => {
    db = testPg();
    for (const t of chosen) {
      const { rows } = await db.query(`update tanks set device_token_hash = $2 where serial = $1 returning id`, [
        t.serial,
        hashDeviceToken(demoDeviceToken(KEY, t.serial)),
      ]);
      ids.set(t.serial, rows[0].id);
    }
    await clearTelemetry(db, [...ids.values()]);
    // 600× speed: a simulated minute every 100 ms; each reading stamped with the real time.
    fleet = new Fleet({
      tanks: chosen,
      mqttUrl: mqttUrl(),
      tokenKey: KEY,
      speed: 600,
      backfillDays: 0,
      ingestUrl: null,
      stateFile: null,
      log: (l) => lines.push(l),
      sendTimeoutMs: 2000,
    });
    await fleet.connect();
    fleet.live();
  });
  afterAll(async () => {
    await fleet?.stop();
    await db?.end();
  });

  const id = (serial: string) => ids.get(serial)!;
  const about = (serial: string, words: string) => lines.filter((l) => l.includes(serial) && l.includes(words));

  it('keeps the other tanks reporting, says so once, and catches up when the tank can log in again', async () => {
    expect(chosen).toHaveLength(4);
    for (const t of chosen)
      await eventually(
        () => readingCount(db, id(t.serial)),
        (n) => n >= 3,
        15_000,
        `readings of ${t.serial}`,
      );
    const [rotated, ...others] = chosen;

    const admin = await signInAs(baseUrl(), 'admin');
    const res = await fetch(`${baseUrl()}/api/tanks/${id(rotated.serial)}/device-token`, {
      method: 'POST',
      headers: { origin: baseUrl(), cookie: admin },
    });
    expect(res.status).toBe(201);
    const rotatedAt = new Date();

    // Several reconnect attempts (every 2 s) and a few dozen ticks later…
    await new Promise((r) => setTimeout(r, 5000));
    const before = await Promise.all(others.map((t) => readingCount(db, id(t.serial))));
    await new Promise((r) => setTimeout(r, 2000));
    const after = await Promise.all(others.map((t) => readingCount(db, id(t.serial))));
    // …every other tank stored more readings (about 20 in 2 s at 10 a second; at least 5 asked here).
    for (const [i, t] of others.entries())
      expect({ serial: t.serial, more: after[i] - before[i] >= 5 }).toEqual({ serial: t.serial, more: true });
    // The rotated tank stored nothing new, and said so once, not at every attempt.
    const since = () =>
      count(db, `select count(*) as n from readings where tank_id = $1 and ts > $2`, [
        id(rotated.serial),
        new Date(rotatedAt.getTime() + 1000),
      ]);
    expect(await since()).toBe(0);
    expect(about(rotated.serial, 'cannot send')).toHaveLength(1);
    expect(lines.filter((l) => l.includes('cannot send'))).toHaveLength(1);

    // The tank's old token is put back (as if its controller were given the new one): it logs in
    // again, says so once, and the readings it kept arrive as a backlog.
    await db.query(`update tanks set device_token_hash = $2 where id = $1`, [
      id(rotated.serial),
      hashDeviceToken(demoDeviceToken(KEY, rotated.serial)),
    ]);
    await eventually(
      async () => about(rotated.serial, 'sending again').length,
      (n) => n === 1,
      15_000,
      'the rotated tank to say it sends again',
    );
    // At least the 5 s + 2 s of ticks while it could not send (about 70 readings; 40 asked here).
    await eventually(since, (n) => n >= 40, 15_000, 'the kept readings to be stored');
    expect(about(rotated.serial, 'cannot send')).toHaveLength(1);
  });
});

describe('simulated fleet backfill with one tank refused', () => {
  it("fills the other tanks' history and leaves the refused one out, saying so once", async () => {
    const db = testPg();
    const tanks = demoTanks()
      .filter((t) => t.companySlug === 'kestrel-vale')
      .slice(235)
      .filter((t) => t.faults.length === 0)
      .slice(0, 3);
    const tankIds: string[] = [];
    for (const [i, t] of tanks.entries()) {
      // The first tank's stored token is another one: the server answers its batches 401.
      const token = i === 0 ? 'hldt_not-this-tank' : demoDeviceToken(KEY, t.serial);
      tankIds.push(
        (
          await db.query(`update tanks set device_token_hash = $2 where serial = $1 returning id`, [
            t.serial,
            hashDeviceToken(token),
          ])
        ).rows[0].id,
      );
    }
    await clearTelemetry(db, tankIds);
    const lines: string[] = [];
    // 0.02 days = 28.8 minutes of history, through POST /api/ingest.
    const fleet = new Fleet({
      tanks,
      mqttUrl: mqttUrl(),
      tokenKey: KEY,
      speed: 600,
      backfillDays: 0.02,
      ingestUrl: `${baseUrl()}/api/ingest`,
      stateFile: null,
      log: (l) => lines.push(l),
      sendTimeoutMs: 2000,
    });
    try {
      await fleet.backfill();
      const counts = await Promise.all(tankIds.map((t) => readingCount(db, t)));
      expect(counts[0]).toBe(0);
      for (const n of counts.slice(1)) expect(n).toBeGreaterThanOrEqual(28);
      expect(lines.filter((l) => l.includes(tanks[0].serial) && l.includes('cannot send'))).toHaveLength(1);
    } finally {
      await fleet.stop();
      await db.end();
    }
  });
});
