import { sql } from 'drizzle-orm';
import { db } from '..';
import type { Scope } from '../../lib/server/authz';
import { attentionKinds, type AttentionKind } from '../../lib/views/attention';
import type { FleetSummary } from '../../lib/views/contracts';
import type { FiguresStatus } from '../../lib/thermal';
import { litreBins, shareBins } from '../../lib/views/distribution';
import { scopeWhere } from './scope';
import { attentionQueue } from './tanks';

/** How many tanks the triage queue lists. */
const QUEUE_LENGTH = 12;

/**
 * The fleet strip and the triage queue. The distributions read every tank's latest state, so the
 * answer is kept for a few seconds and shared by every desk page polling it (see `fleetSummary`).
 * What needs attention is the unresolved alerts, as in the tank list and the alert inbox.
 */
async function computeSummary(scope: Scope): Promise<FleetSummary> {
  const at = Date.now();
  const [charge, open, queue] = await Promise.all([
    db().execute<{ soc: number | null; v40_l: number | null; heard: boolean; quality: FiguresStatus | null }>(sql`
      select l.soc, l.v40_l, l.last_seen_at is not null as heard, l.figures_quality->>'status' as quality from tanks t left join tank_latest_state l on l.tank_id = t.id where ${scopeWhere(scope)}`),
    db().execute<{ kind: AttentionKind | null; n: number }>(sql`
      select x.kind, count(*)::int as n from alerts x join tanks t on t.id = x.tank_id
      where x.company_id = ${scope.companyId} and x.state <> 'resolved' and ${scopeWhere(scope)}
      group by grouping sets ((x.kind), ())`),
    attentionQueue(scope, QUEUE_LENGTH),
  ]);
  const byAttention = Object.fromEntries(attentionKinds.map((k) => [k, 0])) as Record<AttentionKind, number>;
  for (const r of open.rows) if (r.kind) byAttention[r.kind] = r.n;
  const flagged = await db().execute<{ n: number }>(sql`
    select count(distinct x.tank_id)::int as n from alerts x join tanks t on t.id = x.tank_id
    where x.company_id = ${scope.companyId} and x.state <> 'resolved' and ${scopeWhere(scope)}`);
  const socs = charge.rows.map((r) => r.soc);
  const v40s = charge.rows.map((r) => r.v40_l);
  const known = socs.filter((s): s is number => s !== null);
  return {
    tanks: charge.rows.length,
    // Reporting: heard from at least once and not silent now (the offline rule judges only tanks it has heard).
    reporting: charge.rows.filter((r) => r.heard).length - byAttention.offline,
    offline: byAttention.offline,
    needingAttention: flagged.rows[0]?.n ?? 0,
    byAttention,
    socBins: shareBins(socs),
    v40Bins: litreBins(v40s),
    meanSoc: known.length ? known.reduce((a, b) => a + b, 0) / known.length : null,
    totalV40L: v40s.reduce<number>((a, b) => a + (b ?? 0), 0),
    figuresQuality: qualityCounts(charge.rows),
    queue,
    computedAt: new Date(at).toISOString(),
  };
}

/** Heard-from tanks by the quality of their latest figures (rows from before it was kept: measured). */
function qualityCounts(
  rows: readonly { heard: boolean; quality: FiguresStatus | null }[],
): Record<FiguresStatus, number> {
  const out: Record<FiguresStatus, number> = { measured: 0, estimated: 0, withheld: 0 };
  for (const r of rows) if (r.heard) out[r.quality ?? 'measured'] += 1;
  return out;
}

/** Kept this long before a request triggers a refresh (the views' live target is about 10 s). */
const FRESH_MS = 10_000;
/** Served while a refresh runs in the background, up to this age; older ones are waited for. */
const STALE_MS = 60_000;
const summaries = new Map<string, { value?: FleetSummary; at: number; pending?: Promise<FleetSummary> }>();

/** The fleet summary of a scope: fresh, or stale while a refresh runs. */
export async function fleetSummary(scope: Scope): Promise<FleetSummary> {
  const key = `${scope.companyId}|${scope.homeIds?.join(',') ?? '*'}`;
  const slot = summaries.get(key) ?? { at: 0 };
  summaries.set(key, slot);
  const age = slot.value ? Date.now() - slot.at : Infinity;
  if (age < FRESH_MS) return slot.value!;
  slot.pending ??= computeSummary(scope).then(
    (s) => {
      slot.value = s;
      slot.at = Date.parse(s.computedAt);
      slot.pending = undefined;
      return s;
    },
    (err) => {
      slot.pending = undefined;
      throw err;
    },
  );
  return age < STALE_MS ? slot.value! : slot.pending;
}

/** Forget cached summaries (the benchmark measures a cold computation with it). */
export function clearFleetSummaries(): void {
  summaries.clear();
}
