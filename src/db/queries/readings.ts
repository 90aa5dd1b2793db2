import { sql } from 'drizzle-orm';
import { db, lagTolerant } from '..';
import type { Resolution } from '../../lib/views/contracts';
import { rawToRow, rollupToRow, type SeriesRow } from '../../lib/views/series';
import type { EventRow } from '../../lib/views/timeline';

/**
 * Readings of one tank in [from, to): raw rows, or the 15-minute / hourly rollups. The caller has
 * already checked the tank is in the viewer's scope. Lag-tolerant: on the hot standby where there is one.
 */
export async function readingsInRange(
  tankId: string,
  from: Date,
  to: Date,
  resolution: Resolution,
): Promise<SeriesRow[]> {
  if (resolution === 'raw') {
    const res = await lagTolerant((d) =>
      d.execute<{
        ts: Date;
        layers_cc: (number | null)[];
        compressor: boolean | null;
        immersion_w: number | null;
        draw_dlpm: number | null;
        flow_cc: number | null;
      }>(sql`
      select ts, layers_cc, compressor, immersion_w, draw_dlpm, flow_cc from readings
      where tank_id = ${tankId} and ts >= ${from} and ts < ${to} order by ts`),
    );
    return res.rows.map((r) =>
      rawToRow({
        ts: new Date(r.ts),
        layersCc: r.layers_cc,
        compressor: r.compressor,
        immersionW: r.immersion_w,
        drawDlpm: r.draw_dlpm,
        flowCc: r.flow_cc,
      }),
    );
  }
  const table = resolution === '15m' ? sql`rollups_15m` : sql`rollups_1h`;
  const res = await lagTolerant((d) =>
    d.execute<{
      bucket: Date;
      samples: number;
      layers_avg_cc: (number | null)[];
      compressor_samples: number;
      immersion_samples: number;
      draw_avg_lpm: number | null;
      flow_avg_cc: number | null;
    }>(sql`
    select bucket, samples, layers_avg_cc, compressor_samples, immersion_samples, draw_avg_lpm, flow_avg_cc from ${table}
    where tank_id = ${tankId} and bucket >= ${from} and bucket < ${to} order by bucket`),
  );
  return res.rows.map((r) =>
    rollupToRow({
      bucket: new Date(r.bucket),
      samples: r.samples,
      layersAvgCc: r.layers_avg_cc,
      compressorSamples: r.compressor_samples,
      immersionSamples: r.immersion_samples,
      drawAvgLpm: r.draw_avg_lpm,
      flowAvgCc: r.flow_avg_cc,
    }),
  );
}

/** Derived events overlapping [from, to), oldest first, and the last compressor start before `from`. */
export async function eventsInRange(
  tankId: string,
  from: Date,
  to: Date,
): Promise<{ rows: EventRow[]; startBefore: Date | null }> {
  const res = await db().execute<{
    kind: EventRow['kind'];
    started_at: Date;
    ended_at: Date | null;
    energy_wh: number;
    litres: number;
    complete: boolean;
  }>(sql`
    select kind, started_at, ended_at, energy_wh, litres, complete from telemetry_events
    where tank_id = ${tankId} and started_at < ${to} and (ended_at is null or ended_at >= ${from})
    order by started_at`);
  const before = await db().execute<{ started_at: Date }>(sql`
    select started_at from telemetry_events where tank_id = ${tankId} and kind = 'compressor_run' and started_at < ${from}
    order by started_at desc limit 1`);
  return {
    rows: res.rows.map((r) => ({
      kind: r.kind,
      startedAt: new Date(r.started_at),
      endedAt: r.ended_at ? new Date(r.ended_at) : null,
      energyWh: Number(r.energy_wh),
      litres: Number(r.litres),
      complete: r.complete,
    })),
    startBefore: before.rows[0] ? new Date(before.rows[0].started_at) : null,
  };
}

export interface CommandSummary {
  id: string;
  kind: string;
  state: string;
  params: Record<string, unknown>;
  createdAt: Date;
  appliedAt: Date | null;
}

/** A `commands` row as SQL returns it, and as the views read it. */
type CommandRowSql = {
  id: string;
  kind: string;
  state: string;
  params: Record<string, unknown>;
  created_at: Date;
  applied_at: Date | null;
};
const commandOf = (r: CommandRowSql): CommandSummary => ({
  id: r.id,
  kind: r.kind,
  state: r.state,
  params: r.params,
  createdAt: new Date(r.created_at),
  appliedAt: r.applied_at ? new Date(r.applied_at) : null,
});

/** Commands created in [from, to), oldest first. */
export async function commandsInRange(tankId: string, from: Date, to: Date): Promise<CommandSummary[]> {
  const res = await db().execute<CommandRowSql>(sql`
    select id, kind, state, params, created_at, applied_at from commands where tank_id = ${tankId} and created_at >= ${from} and created_at < ${to} order by created_at`);
  return res.rows.map(commandOf);
}

/** The newest applied schedule command, if any (the household's schedule as the tank has it). */
export async function latestAppliedSchedule(tankId: string): Promise<CommandSummary | null> {
  const res = await db().execute<CommandRowSql>(sql`
    select id, kind, state, params, created_at, applied_at from commands where tank_id = ${tankId} and kind = 'set_schedule' and state = 'applied'
    order by created_at desc limit 1`);
  return res.rows[0] ? commandOf(res.rows[0]) : null;
}
