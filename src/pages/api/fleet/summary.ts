import { attentionSnapshot } from '../../../db/queries/fleet';
import { listTanksByIds } from '../../../db/queries/tanks';
import { requireViewer, scopeOf } from '../../../lib/server/authz';
import { endpoint } from '../../../lib/server/endpoint';
import { json } from '../../../lib/server/http';
import { attentionKinds, type AttentionKind } from '../../../lib/views/attention';
import type { FleetSummary } from '../../../lib/views/contracts';
import { litreBins, shareBins } from '../../../lib/views/distribution';

/** How many tanks the triage queue lists. */
const QUEUE_LENGTH = 12;

/** GET /api/fleet/summary: counts and distributions for the fleet strip, and the triage queue. */
export const GET = endpoint(async ({ locals }) => {
  const viewer = requireViewer(locals, ['admin', 'operator']);
  const scope = scopeOf(viewer);
  const snap = await attentionSnapshot(scope);
  const byAttention = Object.fromEntries(attentionKinds.map((k) => [k, 0])) as Record<AttentionKind, number>;
  for (const e of snap.byTank.values()) for (const k of e.kinds) byAttention[k]++;
  // Most urgent first; among equals, the tank with more problems first.
  const queueIds = [...snap.byTank.values()].sort((a, b) => a.rank - b.rank || b.kinds.length - a.kinds.length || a.tankId.localeCompare(b.tankId)).slice(0, QUEUE_LENGTH).map((e) => e.tankId);
  const socs = snap.socs.filter((s): s is number => s !== null);
  const body: FleetSummary = {
    tanks: snap.scanned,
    reporting: snap.reporting,
    offline: byAttention.offline,
    needingAttention: snap.byTank.size,
    byAttention,
    socBins: shareBins(snap.socs),
    v40Bins: litreBins(snap.v40s),
    meanSoc: socs.length ? socs.reduce((a, b) => a + b, 0) / socs.length : null,
    totalV40L: snap.v40s.reduce<number>((a, b) => a + (b ?? 0), 0),
    queue: await listTanksByIds(scope, queueIds, snap),
    computedAt: new Date(snap.at).toISOString(),
  };
  return json(body);
});
