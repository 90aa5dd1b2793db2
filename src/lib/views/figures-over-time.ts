// Figures over a window of readings, for the charts and the analyses: each reading's column goes
// through the thermal core's `tankFigures` (via `columnFigures`), with the stuck check stepped over
// the readings in time order as the writer steps it for the latest state. So a chart, the
// standing-loss fit and the legionella count leave out the same sensors the tank list does.
import { figuresOverTime as coreFiguresOverTime, type TankFigures } from '../thermal';
import type { PointQuality, WindowQuality } from './contracts';
import { geometryOf, type TankShape } from './layers';

/** Each row's figures (null for a row without layers), in the rows' order (oldest first): the thermal core's. */
export function figuresOverTime(
  rows: readonly { t: number; layersC: readonly (number | null)[] }[],
  tank: TankShape & { sensorCount: number },
): (TankFigures | null)[] {
  return coreFiguresOverTime(rows, geometryOf(tank));
}

const count = (n: number) => n.toLocaleString('en-GB');

/** What a chart point keeps of a reading's figures. */
export interface PointFigures {
  soc: number | null;
  v40L: number | null;
  quality: PointQuality | null;
}

export const pointFigures = (f: TankFigures | null): PointFigures | null =>
  f ? { soc: f.soc, v40L: f.v40L, quality: pointQuality(f) } : null;

/** One reading's quality as the readings API sends it: leftOut and reason only where they say something. */
export function pointQuality(f: TankFigures | null): PointQuality | null {
  if (!f) return null;
  const { status, leftOut, reason } = f.quality;
  if (status === 'measured') return { status };
  return status === 'withheld' && reason
    ? { status, leftOut: [...leftOut], reason }
    : { status, leftOut: [...leftOut] };
}

/**
 * One quality for a window: measured when no reading needed an estimate; estimated, naming every
 * sensor left out somewhere and in how many readings; withheld when no reading could be used.
 * Takes each reading's quality (null for a reading without layers), so the tank page can work it
 * out again over the points it keeps after merging a poll.
 */
export function windowQuality(points: readonly (PointQuality | null)[]): WindowQuality {
  const present = points.filter((q): q is PointQuality => q !== null);
  const used = present.filter((q) => q.status !== 'withheld');
  if (present.length > 0 && used.length === 0) {
    const last = present.at(-1)!;
    return { status: 'withheld', leftOut: [...(last.leftOut ?? [])], reason: last.reason ?? null };
  }
  const estimated = used.filter((q) => q.status === 'estimated');
  if (estimated.length === 0) return { status: 'measured', leftOut: [], reason: null };
  const leftOut = [...new Set(estimated.flatMap((q) => q.leftOut ?? []))].sort((a, b) => a - b);
  const names =
    leftOut.length === 1 ? `sensor ${leftOut[0]}` : `sensors ${leftOut.slice(0, -1).join(', ')} and ${leftOut.at(-1)}`;
  const share =
    estimated.length === used.length
      ? 'in every reading used'
      : `in ${count(estimated.length)} of ${count(used.length)} readings used`;
  return { status: 'estimated', leftOut, reason: `Estimated, ${names} left out (${share}).` };
}
