import { readingsInRange } from '../../../../db/queries/readings';
import { requireTank, requireViewer, scopeOf } from '../../../../lib/server/authz';
import { endpoint } from '../../../../lib/server/endpoint';
import { json } from '../../../../lib/server/http';
import { rangeQuerySchema, searchParams } from '../../../../lib/views/contracts';
import { sensorPositions } from '../../../../lib/views/layers';
import { toSeries } from '../../../../lib/views/series';
import { getTank } from '../../../../db/queries/tanks';

/** GET /api/tanks/{id}/readings?from&to&resolution: layers and scalars over time, columnar. */
export const GET = endpoint(async ({ locals, params, url }) => {
  const viewer = requireViewer(locals);
  const tank = await requireTank(getTank, scopeOf(viewer), params.id);
  const range = rangeQuerySchema.parse(searchParams(url));
  const rows = await readingsInRange(tank.id, range.from, range.to, range.resolution);
  const positionsM = sensorPositions(tank.sensorCount, tank.heightM, tank.sensorHeightsM);
  return json(toSeries(rows, { ...tank, positionsM }, range));
});
