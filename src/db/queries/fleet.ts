import { sql, type SQL } from 'drizzle-orm';
import { db } from '..';
import type { Scope } from '../../lib/server/authz';
import { attentionKinds, attentionPriority, attentionThresholds as th, type AttentionFacts, type AttentionKind } from '../../lib/views/attention';
import { hasHeatPump } from '../../lib/views/labels';
import { layersFromCc } from '../../lib/views/layers';
import type { HeatSource } from '../schema/homes';
import { listOpenAlertsForCompany } from './alerts';

/**
 * Who needs attention across a scope, and why. The facts come from the latest-state table and from
 * aggregates over the last day of compressor runs and the last week of energy events and hourly
 * rollups; the decision is `attentionFor` (src/lib/views/attention.ts). Computing it reads every
 * tank of the scope, so the answer is kept for a few seconds and shared by the list, the summary
 * and the triage queue (see `attentionSnapshot`).
 */
export interface AttentionEntry { tankId: string; kinds: AttentionKind[]; rank: number }
export interface AttentionSnapshot { at: number; byTank: Map<string, AttentionEntry>; scanned: number; socs: (number | null)[]; v40s: (number | null)[]; reporting: number }

type FactsRow = {
  id: string; heat_source: HeatSource; last_seen_at: Date | null; online: boolean | null; layers_cc: (number | null)[] | null;
  v40_l: number | null; soc: number | null; starts: string | null; held_hours: number | null; rollup_hours: number | null; imm_wh: number | null; comp_wh: number | null;
}

/** The facts attention is decided from, for the tanks matching `where` (a condition on tanks `t`). */
export async function attentionFacts(where: SQL, now = new Date()): Promise<(AttentionFacts & { tankId: string; soc: number | null })[]> {
  const startsFrom = new Date(now.getTime() - (th.shortCycleWindowH * 60 + th.minStartGapMin) * 60_000);
  const weekAgo = new Date(now.getTime() - th.legionellaWindowDays * 86_400_000);
  const res = await db().execute<FactsRow>(sql`
    with scoped as (select t.id, t.heat_source from tanks t where ${where}),
    starts as (
      select e.tank_id, string_agg((extract(epoch from e.started_at) * 1000)::bigint::text, ',' order by e.started_at) as starts
      from telemetry_events e join scoped s on s.id = e.tank_id
      where e.kind = 'compressor_run' and e.started_at >= ${startsFrom} and e.started_at <= ${now}
      group by e.tank_id),
    energy as (
      select e.tank_id,
        sum(e.energy_wh) filter (where e.kind = 'immersion_run') as imm_wh,
        sum(e.energy_wh) filter (where e.kind = 'compressor_run') as comp_wh
      from telemetry_events e join scoped s on s.id = e.tank_id
      where e.kind in ('immersion_run', 'compressor_run') and e.started_at >= ${weekAgo}
      group by e.tank_id),
    legion as (
      select r.tank_id, count(*) filter (where r.top_min_cc >= ${th.legionellaC * 100})::int as held_hours, count(*)::int as rollup_hours
      from rollups_1h r join scoped s on s.id = r.tank_id
      where r.bucket >= ${weekAgo}
      group by r.tank_id)
    select s.id, s.heat_source, l.last_seen_at, l.online, l.layers_cc, l.v40_l, l.soc, st.starts, lg.held_hours, lg.rollup_hours, en.imm_wh, en.comp_wh
    from scoped s
    left join tank_latest_state l on l.tank_id = s.id
    left join starts st on st.tank_id = s.id
    left join energy en on en.tank_id = s.id
    left join legion lg on lg.tank_id = s.id`);
  return res.rows.map((r) => ({
    tankId: r.id,
    soc: r.soc,
    lastSeenAt: r.last_seen_at ? new Date(r.last_seen_at) : null,
    online: r.online,
    layersC: r.layers_cc ? layersFromCc(r.layers_cc) : null,
    v40L: r.v40_l,
    hasHeatPump: hasHeatPump(r.heat_source),
    compressorStarts: r.starts ? r.starts.split(',').map(Number) : [],
    // A legionella verdict needs at least a day of hourly rollups in the window.
    topHeldHours: (r.rollup_hours ?? 0) >= 24 ? (r.held_hours ?? 0) : null,
    immersionWh: Number(r.imm_wh ?? 0),
    compressorWh: Number(r.comp_wh ?? 0),
  }));
}

export function scopeWhere(scope: Scope): SQL {
  if (scope.homeIds === null) return sql`t.company_id = ${scope.companyId}`;
  if (scope.homeIds.length === 0) return sql`false`;
  return sql`t.company_id = ${scope.companyId} and t.home_id = any(string_to_array(${scope.homeIds.join(',')}, ',')::uuid[])`;
}

/**
 * What needs attention is what the alert rules raised and nobody has resolved yet (src/lib/alerts,
 * with their hysteresis and the company's thresholds), so the triage and the alert inbox always
 * agree. Alert kinds the triage has no column for (heat loss, an advisory) stay in the inbox.
 */
async function computeSnapshot(scope: Scope): Promise<AttentionSnapshot> {
  const now = Date.now();
  const [facts, open] = await Promise.all([attentionFacts(scopeWhere(scope), new Date(now)), listOpenAlertsForCompany(scope)]);
  const byTank = new Map<string, AttentionEntry>();
  for (const a of open) {
    const kinds = a.kinds.filter((k): k is AttentionKind => (attentionKinds as readonly string[]).includes(k)).sort((x, y) => attentionPriority[x] - attentionPriority[y]);
    if (kinds.length > 0) byTank.set(a.tankId, { tankId: a.tankId, kinds, rank: attentionPriority[kinds[0]!] });
  }
  const reporting = facts.filter((f) => !byTank.get(f.tankId)?.kinds.includes('offline')).length;
  return { at: now, byTank, scanned: facts.length, socs: facts.map((f) => f.soc), v40s: facts.map((f) => f.v40L), reporting };
}

/** Kept this long before a request triggers a refresh (the views' live target is about 10 s). */
const FRESH_MS = 10_000;
/** Served while a refresh runs in the background, up to this age; older ones are waited for. */
const STALE_MS = 60_000;
const snapshots = new Map<string, { snap?: AttentionSnapshot; pending?: Promise<AttentionSnapshot> }>();

/** The attention snapshot of a scope: fresh, or stale while a refresh runs. */
export async function attentionSnapshot(scope: Scope): Promise<AttentionSnapshot> {
  const key = `${scope.companyId}|${scope.homeIds?.join(',') ?? '*'}`;
  const slot = snapshots.get(key) ?? {};
  snapshots.set(key, slot);
  const age = slot.snap ? Date.now() - slot.snap.at : Infinity;
  if (age < FRESH_MS) return slot.snap!;
  slot.pending ??= computeSnapshot(scope).then(
    (s) => { slot.snap = s; slot.pending = undefined; return s; },
    (err) => { slot.pending = undefined; throw err; },
  );
  return age < STALE_MS ? slot.snap! : slot.pending;
}

/** Forget cached snapshots (benchmarks measure a cold computation with it). */
export function clearAttentionSnapshots(): void {
  snapshots.clear();
}
