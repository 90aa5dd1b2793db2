// The rows the alert rules' evaluation reads and writes, inside the caller's transaction: the
// tank with its rule state (locked), its unresolved kinds, its stored readings after a point, the
// alerts a transition opens or resolves, and the state carried forward. The rules themselves run
// in src/lib/alerts (evaluate.server.ts); nothing here computes.
import { sql } from 'drizzle-orm';
import type { Tx } from '..';
import type { HeatSource } from '../../lib/heat-sources';
import type { AlertEvidence, AlertKind, AlertSeverity } from '../../lib/alerts/types';

export type AlertTankRow = {
  id: string;
  company_id: string;
  volume_l: number;
  sensor_count: number;
  heat_source: HeatSource;
  declared_loss_w: number | null;
  occupants: number | null;
  height_m: number;
  sensor_heights_m: number[] | null;
  target_c: number;
  cold_inlet_c: number | null;
  /** The rules' carried state (the engine's EngineState, stored as JSON). */ state: unknown;
  evaluated_ms: string | null;
  latest_ms: string | null;
  seen_ms: string | null;
};

/** The tank, its facts and its rule state, the state row locked (made on first use). */
export async function lockAlertTank(tx: Tx, tankId: string): Promise<AlertTankRow | null> {
  await tx.execute(
    sql`insert into alert_tank_state (tank_id) select id from tanks where id = ${tankId} on conflict do nothing`,
  );
  const res = await tx.execute<AlertTankRow>(sql`
    select t.id, t.company_id, t.volume_l, t.sensor_count, t.heat_source, t.declared_loss_w, h.occupants,
      t.height_m, t.sensor_heights_m, t.target_c, h.cold_inlet_c,
      (extract(epoch from s.evaluated_to) * 1000)::int8 as evaluated_ms, s.state,
      (extract(epoch from l.ts) * 1000)::int8 as latest_ms,
      (extract(epoch from l.last_seen_at) * 1000)::int8 as seen_ms
    from alert_tank_state s join tanks t on t.id = s.tank_id left join homes h on h.id = t.home_id
    left join tank_latest_state l on l.tank_id = t.id
    where s.tank_id = ${tankId} for update of s`);
  return res.rows[0] ?? null;
}

export async function openAlertKinds(tx: Tx, tankId: string): Promise<Set<AlertKind>> {
  const res = await tx.execute<{ kind: AlertKind }>(
    sql`select kind from alerts where tank_id = ${tankId} and state <> 'resolved'`,
  );
  return new Set(res.rows.map((r) => r.kind));
}

/** A stored reading as the database keeps it (centi-degrees, decilitres a minute). */
export type StoredReadingRow = {
  ts_ms: string;
  seq: number | null;
  layers_cc: (number | null)[];
  flow_cc: number | null;
  return_cc: number | null;
  compressor: boolean | null;
  immersion_w: number | null;
  power_w: number | null;
  pump_pct: number | null;
  draw_dlpm: number | null;
  solar_surplus_w: number | null;
};

export async function storedReadingsAfter(
  tx: Tx,
  tankId: string,
  afterMs: number,
  limit: number,
): Promise<StoredReadingRow[]> {
  const res = await tx.execute<StoredReadingRow>(sql`
    select (extract(epoch from ts) * 1000)::int8 as ts_ms, seq, layers_cc, flow_cc, return_cc, compressor, immersion_w, power_w, pump_pct, draw_dlpm, solar_surplus_w
    from readings where tank_id = ${tankId} and ts > ${new Date(afterMs).toISOString()}::timestamptz order by ts limit ${limit}`);
  return res.rows;
}

/** Opens an alert of `kind` unless one is unresolved (the partial unique index decides, whatever races); its id, or null. */
export async function openAlert(
  tx: Tx,
  tank: { id: string; companyId: string },
  kind: AlertKind,
  severity: AlertSeverity,
  evidence: AlertEvidence,
  at: number,
): Promise<string | null> {
  const res = await tx.execute<{ id: string }>(sql`
    insert into alerts (company_id, tank_id, kind, severity, state, evidence, opened_at)
    values (${tank.companyId}, ${tank.id}, ${kind}, ${severity}, 'open', ${JSON.stringify(evidence)}::jsonb, ${new Date(at).toISOString()}::timestamptz)
    on conflict (tank_id, kind) where state <> 'resolved' do nothing returning id`);
  return res.rows[0]?.id ?? null;
}

/** Resolves the tank's unresolved alert of `kind` (never before it opened); the ids resolved. */
export async function resolveOpenAlert(tx: Tx, tankId: string, kind: AlertKind, at: number): Promise<string[]> {
  const res = await tx.execute<{ id: string }>(sql`
    update alerts set state = 'resolved', resolved_at = greatest(opened_at, ${new Date(at).toISOString()}::timestamptz), updated_at = now()
    where tank_id = ${tankId} and kind = ${kind} and state <> 'resolved' returning id`);
  return res.rows.map((r) => r.id);
}

/** Carries the rules' state forward, with the newest reading it has judged. */
export async function saveAlertState(tx: Tx, tankId: string, state: { lastTs: number | null }): Promise<void> {
  await tx.execute(sql`
    update alert_tank_state set state = ${JSON.stringify(state)}::jsonb,
      evaluated_to = ${state.lastTs === null ? null : new Date(state.lastTs).toISOString()}::timestamptz, updated_at = now()
    where tank_id = ${tankId}`);
}
