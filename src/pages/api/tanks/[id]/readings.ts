import { getTank } from '../../../../db/queries/tanks';
import { requireTank, requireViewer, scopeOf } from '../../../../lib/server/authz';
import { endpoint } from '../../../../lib/server/endpoint';
import { json } from '../../../../lib/server/http';
import { rangeQuerySchema, searchParams } from '../../../../lib/views/contracts';
import { tankSeries } from '../../../../lib/views/tank-series.server';

/**
 * GET /api/tanks/{id}/readings?from&to&resolution&since: layers and scalars over time, columnar. The
 * tank page polls its window with `since` at its newest point and the same resolution, and merges
 * what comes back (`mergeSeries`).
 */
export const GET = endpoint(async ({ locals, params, url }) => {
  const viewer = requireViewer(locals);
  const tank = await requireTank(getTank, scopeOf(viewer), params.id);
  return json(await tankSeries(tank, rangeQuerySchema.parse(searchParams(url))));
});
