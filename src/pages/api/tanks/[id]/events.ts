import { thresholdsFor } from '../../../../db/queries/alerts';
import { commandsInRange, eventsInRange } from '../../../../db/queries/readings';
import { requireTank, requireViewer, scopeOf } from '../../../../lib/server/authz';
import { endpoint } from '../../../../lib/server/endpoint';
import { json } from '../../../../lib/server/http';
import {
  eventsQuerySchema,
  searchParams,
  type EventsResponse,
  type TimelineEvent,
} from '../../../../lib/views/contracts';
import { markShortCycles } from '../../../../lib/views/timeline';
import { getTank } from '../../../../db/queries/tanks';
import { staffRoles } from '@/db/schema/companies';

/** GET /api/tanks/{id}/events?from&to: compressor and immersion runs, draws and commands, oldest first. */
export const GET = endpoint(async ({ locals, params, url }) => {
  const viewer = requireViewer(locals, staffRoles);
  const tank = await requireTank(getTank, scopeOf(viewer), params.id);
  const { from, to } = eventsQuerySchema.parse(searchParams(url));
  const [{ rows, startBefore }, commands, th] = await Promise.all([
    eventsInRange(tank.id, from, to),
    commandsInRange(tank.id, from, to),
    thresholdsFor(viewer.companyId),
  ]);
  // Starts marked with the gap the short-cycling alert uses (the company's setting).
  const minGap = th.shortCycleMinGapMin;
  const runs = markShortCycles(rows, minGap, startBefore);
  const cmds: TimelineEvent[] = commands.map((c) => ({
    kind: 'command',
    startedAt: c.createdAt.toISOString(),
    endedAt: c.appliedAt?.toISOString() ?? null,
    energyWh: null,
    litres: null,
    complete: c.state === 'applied',
    shortCycle: false,
    command: { id: c.id, kind: c.kind, state: c.state, params: c.params },
  }));
  const items = [...runs, ...cmds].sort((a, b) => Date.parse(a.startedAt) - Date.parse(b.startedAt));
  const body: EventsResponse = {
    tankId: tank.id,
    from: from.toISOString(),
    to: to.toISOString(),
    items,
    shortCycleStarts: runs.filter((r) => r.shortCycle).length,
    minStartGapMin: minGap,
  };
  return json(body);
});
