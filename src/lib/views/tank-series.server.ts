// One tank's readings over a range as chart columns, for the readings API and its CSV export: raw
// readings take their figures from the memo (worked out once per reading), rollup buckets (a
// minute's poll at most) work them out each time. Server-only (reads through src/db/queries).
import { readingsInRange } from '../../db/queries/readings';
import type { TankRecord } from '../../db/queries/tanks';
import type { RangeQuery, ReadingsResponse } from './contracts';
import { memoFigures } from './figures-memo';
import { sensorPositions } from './layers';
import { toSeries } from './series';

export async function tankSeries(tank: TankRecord, range: RangeQuery): Promise<ReadingsResponse> {
  const rows = await readingsInRange(tank.id, range.from, range.to, range.resolution);
  const shape = { ...tank, positionsM: sensorPositions(tank.sensorCount, tank.heightM, tank.sensorHeightsM) };
  return range.resolution === 'raw'
    ? toSeries(rows, shape, range, memoFigures(tank.id, rows, tank))
    : toSeries(rows, shape, range);
}
