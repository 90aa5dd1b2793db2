// The one writer of telemetry, shared by the MQTT ingest worker and `POST /api/ingest`.
//
// A batch is written in one transaction: readings are COPYed into a per-connection staging table
// and moved into the partitioned `readings` table with ON CONFLICT DO NOTHING, so replays and
// duplicates are harmless (idempotent on tank and time). Only the readings that were really new
// then advance each tank's latest state and its derived events; dead letters of the same batch
// commit with it. Either all of it is stored or none of it is, so the caller may acknowledge the
// messages once write() resolves and must not when it rejects.
import type pg from 'pg';
import { from as copyFrom } from 'pg-copy-streams';
import { pipeline } from 'node:stream/promises';
import { Readable } from 'node:stream';
import {
  DEFAULT_STUCK_LIMITS,
  initialStuck,
  stepStuck,
  stuckSensors,
  tankFigures,
  type FiguresQuality,
  type StuckState,
  type TankGeometry,
} from '../thermal';
import type { StoredReadingRow } from '../../db/queries/alert-evaluation';
import type { DeadLetterInput, IngestTank } from '../../db/queries/telemetry';
import { deriveEvents, emptyDeriveState, type DeriveState, type EventRecord } from './events';
import type { Reading } from './wire';

export interface IngestItem {
  tank: IngestTank;
  reading: Reading;
}

export interface WriteBatch {
  readings: readonly IngestItem[];
  deadLetters?: readonly DeadLetterInput[];
}

export interface WriteResult {
  /** Readings stored by this batch. */
  inserted: number;
  /** Readings already stored (replays, duplicates inside the batch). */
  duplicates: number;
  /** Events opened, extended or closed. */
  events: number;
}

const COPY_COLUMNS =
  'tank_id, ts, seq, layers_cc, flow_cc, return_cc, compressor, immersion_w, power_w, pump_pct, draw_dlpm, solar_surplus_w';

/** A reading as stored: centi-degrees, decilitres a minute, whole watts. */
export interface StoredReading {
  tankId: string;
  ts: number;
  seq: number | null;
  layersCc: (number | null)[];
  flowCc: number | null;
  returnCc: number | null;
  compressor: boolean | null;
  immersionW: number | null;
  powerW: number | null;
  pumpPct: number | null;
  drawDlpm: number | null;
  /** Optional here only so that event re-derivation, which never reads it, need not load it. */
  solarSurplusW?: number | null;
}

const cc = (c: number | undefined) => (c === undefined ? null : Math.round(c * 100));
const round = (x: number | undefined) => (x === undefined ? null : Math.round(x));

function toStored(tankId: string, r: Reading): StoredReading {
  return {
    tankId,
    ts: r.ts,
    seq: r.seq ?? null,
    layersCc: r.layersC.map((t) => (t === null ? null : Math.round(t * 100))),
    flowCc: cc(r.flowC),
    returnCc: cc(r.returnC),
    compressor: r.compressor ?? null,
    immersionW: round(r.immersionW),
    powerW: round(r.powerW),
    pumpPct: round(r.pumpPct),
    drawDlpm: r.drawLpm === undefined ? null : Math.round(r.drawLpm * 10),
    solarSurplusW: round(r.solarSurplusW),
  };
}

/** A `readings` row as SQL returns it (time as epoch ms text) back in wire units. */
export const readingOfRow = (tankId: string, x: StoredReadingRow): Reading =>
  fromStored({
    tankId,
    ts: Number(x.ts_ms),
    seq: x.seq,
    layersCc: x.layers_cc,
    flowCc: x.flow_cc,
    returnCc: x.return_cc,
    compressor: x.compressor,
    immersionW: x.immersion_w,
    powerW: x.power_w,
    pumpPct: x.pump_pct,
    drawDlpm: x.draw_dlpm,
    solarSurplusW: x.solar_surplus_w,
  });

/** Back to wire units, as event derivation sees it (the same whether fresh or re-read). */
function fromStored(s: StoredReading): Reading {
  const r: Reading = { ts: s.ts, layersC: s.layersCc.map((v) => (v === null ? null : v / 100)) };
  if (s.flowCc !== null) r.flowC = s.flowCc / 100;
  if (s.returnCc !== null) r.returnC = s.returnCc / 100;
  if (s.compressor !== null) r.compressor = s.compressor;
  if (s.immersionW !== null) r.immersionW = s.immersionW;
  if (s.powerW !== null) r.powerW = s.powerW;
  if (s.pumpPct !== null) r.pumpPct = s.pumpPct;
  if (s.drawDlpm !== null) r.drawLpm = s.drawDlpm / 10;
  if (s.solarSurplusW != null) r.solarSurplusW = s.solarSurplusW;
  if (s.seq !== null) r.seq = s.seq;
  return r;
}

const copyValue = (v: number | boolean | null) =>
  v === null ? '\\N' : typeof v === 'boolean' ? (v ? 't' : 'f') : String(v);

function copyLine(s: StoredReading): string {
  return `${[
    s.tankId,
    new Date(s.ts).toISOString(),
    copyValue(s.seq),
    `{${s.layersCc.map((v) => (v === null ? 'NULL' : String(v))).join(',')}}`,
    copyValue(s.flowCc),
    copyValue(s.returnCc),
    copyValue(s.compressor),
    copyValue(s.immersionW),
    copyValue(s.powerW),
    copyValue(s.pumpPct),
    copyValue(s.drawDlpm),
    copyValue(s.solarSurplusW ?? null),
  ].join('\t')}\n`;
}

/** What the figures need of a tank, read with its latest state (so an amended target counts at once). */
export interface FiguresTank extends TankGeometry {
  stuck: StuckState | null;
}

/**
 * The latest figures of a tank: the thermal core's `tankFigures` (doubted sensors left out and
 * estimated, or the figures withheld), the same function every screen calls.
 */
export function chargeOf(
  tank: FiguresTank,
  layersC: readonly (number | null)[],
): { soc: number | null; v40L: number | null; quality: FiguresQuality } {
  const f = tankFigures({ layersC }, tank, { stuck: stuckSensors(tank.stuck) });
  return { soc: f.soc, v40L: f.v40L, quality: f.quality };
}

const staged = new WeakSet<pg.PoolClient>();

export class TelemetryWriter {
  constructor(private readonly pool: pg.Pool) {}

  async write(batch: WriteBatch): Promise<WriteResult> {
    if (batch.readings.length === 0 && !batch.deadLetters?.length) return { inserted: 0, duplicates: 0, events: 0 };
    const client = await this.pool.connect();
    let broken = false;
    // The server going away between two statements arrives as an 'error' event; note it (and never
    // let it throw) so this connection is discarded rather than reused.
    const onError = () => {
      broken = true;
    };
    client.on('error', onError);
    try {
      await client.query('begin');
      const result = await this.writeInTransaction(client, batch);
      await client.query('commit');
      return result;
    } catch (err) {
      broken = true;
      await client.query('rollback').catch(() => undefined);
      throw err;
    } finally {
      client.off('error', onError);
      // A connection that failed mid-COPY may be unusable; do not hand it to the next batch.
      client.release(broken ? true : undefined);
      if (broken) staged.delete(client);
    }
  }

  private async writeInTransaction(client: pg.PoolClient, batch: WriteBatch): Promise<WriteResult> {
    if (batch.deadLetters?.length) await insertDeadLettersWith(client, batch.deadLetters);
    if (batch.readings.length === 0) return { inserted: 0, duplicates: 0, events: 0 };

    const rows = batch.readings.map((item) => toStored(item.tank.id, item.reading));

    const copied = await copyStraightIn(client, rows);
    const freshRows = copied ? rows : await insertThroughStaging(client, rows);
    const newByTank = new Map<string, StoredReading[]>();
    for (const row of freshRows) {
      let list = newByTank.get(row.tankId);
      if (!list) newByTank.set(row.tankId, (list = []));
      list.push(row);
    }
    const inserted = freshRows.length;
    if (newByTank.size === 0) return { inserted, duplicates: rows.length - inserted, events: 0 };
    await markRollupsDirty(client, freshRows);

    const events = await this.advanceTanks(client, newByTank);
    return { inserted, duplicates: rows.length - inserted, events };
  }

  /** Latest state and events of every tank that received new readings. */
  private async advanceTanks(client: pg.PoolClient, newByTank: Map<string, StoredReading[]>): Promise<number> {
    // Lock in a fixed order so two writers touching the same tanks cannot deadlock.
    const ids = [...newByTank.keys()].sort();
    const lockStates = () =>
      client.query<{
        tank_id: string;
        ts_ms: string | null;
        derive: DeriveState;
        sensor_check: StuckState | null;
        volume_l: number;
        height_m: number;
        sensor_count: number;
        sensor_heights_m: number[] | null;
        target_c: number;
        cold_inlet_c: number | null;
      }>(
        `select l.tank_id, (extract(epoch from l.ts) * 1000)::int8 as ts_ms, l.derive, l.sensor_check,
         t.volume_l, t.height_m, t.sensor_count, t.sensor_heights_m, t.target_c, h.cold_inlet_c
       from tank_latest_state l join tanks t on t.id = l.tank_id left join homes h on h.id = t.home_id
       where l.tank_id = any($1::uuid[]) order by l.tank_id for update of l`,
        [ids],
      );
    let current = await lockStates();
    if (current.rows.length < ids.length) {
      // A tank's first reading ever: give it its row, then lock again.
      await client.query(
        `insert into tank_latest_state (tank_id) select unnest($1::uuid[]) order by 1 on conflict do nothing`,
        [ids],
      );
      current = await lockStates();
    }
    const states = new Map(current.rows.map((r) => [r.tank_id, r]));

    const latestUpdates: unknown[] = [];
    const eventRows: unknown[] = [];
    const late: { tankId: string; fromTs: number }[] = [];
    const now = new Date().toISOString();

    for (const tankId of ids) {
      const list = newByTank.get(tankId)!.sort((a, b) => a.ts - b.ts);
      const st = states.get(tankId);
      const derive: DeriveState = st?.derive?.open ? st.derive : emptyDeriveState();
      const newest = list[list.length - 1];
      const latestTs = st?.ts_ms ? Number(st.ts_ms) : null;

      let nextDerive = derive;
      if (derive.lastTs === null || list[0].ts > derive.lastTs) {
        const out = deriveEvents(derive, list.map(fromStored));
        nextDerive = out.state;
        for (const e of out.events) eventRows.push(eventRow(tankId, e));
      } else {
        late.push({ tankId, fromTs: list[0].ts });
      }

      const u: Record<string, unknown> = { tank_id: tankId, last_seen_at: now, derive: nextDerive, advance: false };
      if (latestTs === null || newest.ts > latestTs) {
        // The stuck check follows the readings newer than the latest, in time order.
        const check: StuckState = st?.sensor_check ?? initialStuck(st?.sensor_count ?? newest.layersCc.length);
        for (const row of list)
          if (latestTs === null || row.ts > latestTs)
            stepStuck(check, row.ts, fromStored(row).layersC, DEFAULT_STUCK_LIMITS);
        const { soc, v40L, quality } = st
          ? chargeOf(
              {
                volumeL: st.volume_l,
                heightM: st.height_m,
                sensorCount: st.sensor_count,
                sensorHeightsM: st.sensor_heights_m,
                targetC: st.target_c,
                coldInletC: st.cold_inlet_c,
                stuck: check,
              },
              fromStored(newest).layersC,
            )
          : { soc: null, v40L: null, quality: null };
        Object.assign(u, {
          advance: true,
          ts: new Date(newest.ts).toISOString(),
          seq: newest.seq,
          layers_cc: pgArray(newest.layersCc),
          flow_cc: newest.flowCc,
          return_cc: newest.returnCc,
          compressor: newest.compressor,
          immersion_w: newest.immersionW,
          power_w: newest.powerW,
          pump_pct: newest.pumpPct,
          draw_dlpm: newest.drawDlpm,
          soc,
          v40_l: v40L,
          figures_quality: quality,
          sensor_check: check,
        });
      }
      latestUpdates.push(u);
    }

    await client.query(
      `
      update tank_latest_state s set
        last_seen_at = greatest(s.last_seen_at, x.last_seen_at),
        derive = x.derive,
        ts = case when x.advance then x.ts else s.ts end,
        seq = case when x.advance then x.seq else s.seq end,
        layers_cc = case when x.advance then x.layers_cc::smallint[] else s.layers_cc end,
        flow_cc = case when x.advance then x.flow_cc else s.flow_cc end,
        return_cc = case when x.advance then x.return_cc else s.return_cc end,
        compressor = case when x.advance then x.compressor else s.compressor end,
        immersion_w = case when x.advance then x.immersion_w else s.immersion_w end,
        power_w = case when x.advance then x.power_w else s.power_w end,
        pump_pct = case when x.advance then x.pump_pct else s.pump_pct end,
        draw_dlpm = case when x.advance then x.draw_dlpm else s.draw_dlpm end,
        soc = case when x.advance then x.soc else s.soc end,
        v40_l = case when x.advance then x.v40_l else s.v40_l end,
        figures_quality = case when x.advance then x.figures_quality else s.figures_quality end,
        sensor_check = case when x.advance then x.sensor_check else s.sensor_check end
      from json_to_recordset($1::json) as x(
        tank_id uuid, last_seen_at timestamptz, derive jsonb, advance boolean, ts timestamptz, seq integer, layers_cc text,
        flow_cc smallint, return_cc smallint, compressor boolean, immersion_w smallint, power_w smallint, pump_pct smallint,
        draw_dlpm smallint, soc real, v40_l real, figures_quality jsonb, sensor_check jsonb)
      where s.tank_id = x.tank_id`,
      [JSON.stringify(latestUpdates)],
    );

    await upsertEvents(client, eventRows);
    let touched = eventRows.length;
    for (const l of late) touched += await rederive(client, l.tankId, l.fromTs);
    return touched;
  }
}

const copyInto = (client: pg.PoolClient, table: string, rows: readonly StoredReading[]) =>
  // One chunk: per-line chunks make COPY several times slower.
  pipeline(
    Readable.from([rows.map(copyLine).join('')]),
    client.query(copyFrom(`copy ${table} (${COPY_COLUMNS}) from stdin`)),
  );

/**
 * The common case, new readings: COPY them straight into `readings`, as fast as a raw COPY. A
 * duplicate (a replay, or the same time twice in the batch) makes the COPY fail on the primary
 * key; the savepoint then undoes it and the caller takes the staged path. Returns whether it worked.
 */
async function copyStraightIn(client: pg.PoolClient, rows: readonly StoredReading[]): Promise<boolean> {
  await client.query('savepoint straight_in');
  try {
    await copyInto(client, 'readings', rows);
  } catch (err) {
    if ((err as { code?: string }).code !== '23505') throw err; // unique_violation; anything else fails the batch
    await client.query('rollback to savepoint straight_in');
    return false;
  }
  // Left in place: commit releases it, and one round trip fewer a batch.
  return true;
}

/** Replays and duplicates: stage the batch, insert what is not stored yet, and return those rows. */
async function insertThroughStaging(client: pg.PoolClient, rows: readonly StoredReading[]): Promise<StoredReading[]> {
  if (!staged.has(client)) {
    await client.query(`create temp table if not exists readings_in (like readings) on commit delete rows`);
    staged.add(client);
  }
  await copyInto(client, 'readings_in', rows);
  const ins = await client.query<{ tank_id: string; ts_ms: string }>(`
    insert into readings (${COPY_COLUMNS}) select ${COPY_COLUMNS} from readings_in
    on conflict (tank_id, ts) do nothing
    returning tank_id, (extract(epoch from ts) * 1000)::int8 as ts_ms`);
  const fresh = new Set(ins.rows.map((r) => `${r.tank_id}|${r.ts_ms}`));
  // `delete` keeps only the first copy of a reading repeated inside the batch.
  return rows.filter((row) => fresh.delete(`${row.tankId}|${row.ts}`));
}

const ROLLUP_BUCKET_MS = 15 * 60_000;

/** The 15-minute rollup buckets that new readings fall in are recomputed later (src/db/queries/rollups.ts). */
async function markRollupsDirty(client: pg.PoolClient, rows: readonly StoredReading[]): Promise<void> {
  const buckets = new Map<string, { tankId: string; bucket: number }>();
  for (const r of rows) {
    const bucket = Math.floor(r.ts / ROLLUP_BUCKET_MS) * ROLLUP_BUCKET_MS;
    buckets.set(`${r.tankId}|${bucket}`, { tankId: r.tankId, bucket });
  }
  const list = [...buckets.values()];
  await client.query(
    `insert into rollup_dirty (tank_id, bucket)
     select * from unnest($1::uuid[], $2::timestamptz[]) order by 1, 2 on conflict do nothing`,
    [list.map((b) => b.tankId), list.map((b) => new Date(b.bucket).toISOString())],
  );
}

const pgArray = (values: (number | null)[]) => `{${values.map((v) => (v === null ? 'NULL' : String(v))).join(',')}}`;

function eventRow(tankId: string, e: EventRecord) {
  return {
    tank_id: tankId,
    kind: e.kind,
    started_at: new Date(e.startedAt).toISOString(),
    ended_at: e.endedAt === null ? null : new Date(e.endedAt).toISOString(),
    energy_wh: e.energyWh,
    litres: e.litres,
    start_top_cc: e.startTopCc,
    end_top_cc: e.endTopCc,
    complete: e.complete,
  };
}

async function upsertEvents(client: pg.PoolClient, rows: unknown[]): Promise<void> {
  if (rows.length === 0) return;
  await client.query(
    `
    insert into telemetry_events (tank_id, kind, started_at, ended_at, energy_wh, litres, start_top_cc, end_top_cc, complete)
    select tank_id, kind::telemetry_event_kind, started_at, ended_at, energy_wh, litres, start_top_cc, end_top_cc, complete
    from json_to_recordset($1::json) as x(tank_id uuid, kind text, started_at timestamptz, ended_at timestamptz,
      energy_wh real, litres real, start_top_cc smallint, end_top_cc smallint, complete boolean)
    on conflict (tank_id, kind, started_at) do update set
      ended_at = excluded.ended_at, energy_wh = excluded.energy_wh, litres = excluded.litres,
      end_top_cc = excluded.end_top_cc, complete = excluded.complete`,
    [JSON.stringify(rows)],
  );
}

/**
 * Readings older than the newest one arrived (a replay out of order): derive the tank's events
 * again from the stored readings, from the start of the earliest run the late readings could
 * belong to. Rare, and bounded by how late the readings are.
 */
async function rederive(client: pg.PoolClient, tankId: string, fromTs: number): Promise<number> {
  let from = fromTs;
  for (let i = 0; i < 10; i++) {
    const r = await client.query<{ s: string | null }>(
      `select (extract(epoch from min(started_at)) * 1000)::int8 as s from telemetry_events
       where tank_id = $1 and started_at < $2 and (ended_at is null or ended_at >= $2)`,
      [tankId, new Date(from).toISOString()],
    );
    const s = r.rows[0].s === null ? null : Number(r.rows[0].s);
    if (s === null || s >= from) break;
    from = s;
  }
  const fromIso = new Date(from).toISOString();
  const prev = await client.query<{ ts_ms: string }>(
    `select (extract(epoch from ts) * 1000)::int8 as ts_ms from readings where tank_id = $1 and ts < $2 order by ts desc limit 1`,
    [tankId, fromIso],
  );
  await client.query(`delete from telemetry_events where tank_id = $1 and started_at >= $2`, [tankId, fromIso]);
  const rows = await client.query<StoredReadingRow>(
    `select (extract(epoch from ts) * 1000)::int8 as ts_ms, seq, layers_cc, flow_cc, return_cc, compressor, immersion_w, power_w, pump_pct, draw_dlpm, solar_surplus_w
     from readings where tank_id = $1 and ts >= $2 order by ts`,
    [tankId, fromIso],
  );
  const start: DeriveState = { lastTs: prev.rows[0] ? Number(prev.rows[0].ts_ms) : null, open: {} };
  const out = deriveEvents(
    start,
    rows.rows.map((x) => readingOfRow(tankId, x)),
  );
  await upsertEvents(
    client,
    out.events.map((e) => eventRow(tankId, e)),
  );
  await client.query(`update tank_latest_state set derive = $2 where tank_id = $1`, [
    tankId,
    JSON.stringify(out.state),
  ]);
  return out.events.length;
}

async function insertDeadLettersWith(client: pg.PoolClient, rows: readonly DeadLetterInput[]): Promise<void> {
  const MAX = 256 * 1024;
  await client.query(
    `
    insert into dead_letters (tank_id, serial, transport, topic, reason_code, reason, fields, payload, payload_bytes)
    select * from unnest($1::uuid[], $2::text[], $3::text[], $4::text[], $5::text[], $6::text[], $7::jsonb[], $8::bytea[], $9::int[])`,
    [
      rows.map((r) => r.tankId),
      rows.map((r) => r.serial),
      rows.map((r) => r.transport),
      rows.map((r) => r.topic),
      rows.map((r) => r.reasonCode),
      rows.map((r) => r.reason),
      rows.map((r) => JSON.stringify(r.fields)),
      rows.map((r) => r.payload.subarray(0, MAX)),
      rows.map((r) => r.payload.length),
    ],
  );
}
