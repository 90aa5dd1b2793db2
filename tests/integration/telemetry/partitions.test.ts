// Daily reading partitions cover the whole retention window (ingest accepts readings that old), and
// readings that fell into the default partition are moved into their own day.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type pg from 'pg';
import { closeDb } from '../../../src/db';
import { setReadingsRetention } from '../../../src/db/queries/rollups';
import { clearTelemetry, count, tankWithToken, testPg, type TestTank } from './helpers';

const DAY = 86_400_000;
const dayName = (t: number) => `readings_p${new Date(t).toISOString().slice(0, 10).replaceAll('-', '_')}`;

describe('reading partitions', () => {
  let db: pg.Pool;
  let tank: TestTank;

  beforeAll(async () => {
    db = testPg();
    tank = await tankWithToken(db, 180);
    await clearTelemetry(db, [tank.id]);
  });
  afterAll(async () => {
    await db?.end();
    await closeDb();
  });

  const partitionOf = async (ts: Date) =>
    (
      await db.query<{ p: string }>(
        `select tableoid::regclass::text as p from readings where tank_id = $1 and ts = $2`,
        [tank.id, ts],
      )
    ).rows[0]?.p;

  it('has a partition for every day of the retention window', async () => {
    await setReadingsRetention(90);
    const today = Date.UTC(new Date().getUTCFullYear(), new Date().getUTCMonth(), new Date().getUTCDate());
    const names = new Set(
      (
        await db.query<{ p: string }>(
          `select c.relname as p from pg_inherits i join pg_class c on c.oid = i.inhrelid where i.inhparent = 'public.readings'::regclass`,
        )
      ).rows.map((r) => r.p),
    );
    const missing = Array.from({ length: 91 }, (_, i) => dayName(today - i * DAY)).filter((n) => !names.has(n));
    expect(missing).toEqual([]);
    // A reading 60 days old is stored in its day, not in the default partition.
    const old = new Date(today - 60 * DAY + 3_600_000);
    await db.query(`insert into readings (tank_id, ts, layers_cc) values ($1, $2, '{4000,5000}')`, [tank.id, old]);
    expect(await partitionOf(old)).toBe(dayName(old.getTime()));
  });

  it('moves readings that fell into the default partition into their own day', async () => {
    const today = Date.UTC(new Date().getUTCFullYear(), new Date().getUTCMonth(), new Date().getUTCDate());
    const day = today - 75 * DAY; // a day no other test writes to
    const ts = new Date(day + 7_200_000);
    await db.query(`delete from readings where ts >= $1 and ts < $2`, [new Date(day), new Date(day + DAY)]);
    await db.query(`drop table if exists ${dayName(day)}`);
    await db.query(`insert into readings (tank_id, ts, layers_cc) values ($1, $2, '{4000,5000}')`, [tank.id, ts]);
    expect(await partitionOf(ts)).toBe('readings_default');

    await setReadingsRetention(90);
    expect(await partitionOf(ts)).toBe(dayName(day));
    expect(await count(db, `select count(*) as n from readings_default`, [])).toBe(0);
  });
});
