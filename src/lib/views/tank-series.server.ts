// One tank's readings over a range as chart columns, for the readings API and its CSV export.
// Server-only (reads through src/db/queries).
import { readingsInRange } from '../../db/queries/readings';
import type { TankRecord } from '../../db/queries/tanks';
import type { RangeQuery, ReadingsResponse } from './contracts';
import { sensorPositions } from './layers';
import { toSeries } from './series';

export async function tankSeries(tank: TankRecord, range: RangeQuery): Promise<ReadingsResponse> {
  const rows = await readingsInRange(tank.id, range.from, range.to, range.resolution);
  return toSeries(rows, { ...tank, positionsM: sensorPositions(tank.sensorCount, tank.heightM, tank.sensorHeightsM) }, range);
}
