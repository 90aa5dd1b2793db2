// Each raw reading's figures worked out once per process, not once per request. The tank page
// polls its window every 10 s and the thermal core's figures are most of a series' cost (about
// 30 µs a reading, `npm run bench:api`), so a tank's memo keeps every raw reading's figures with the
// stuck check carried past the newest, and steps it only over readings newer than that. Stored
// readings never change (keyed by tank and time); one that arrives late (older than the newest
// already worked out), a window reaching further back, or a change to the tank's geometry, target
// or cold inlet starts the memo again. A reading's figures therefore stay the same from poll to poll.
import { figuresOverTime, initialStuck, type StuckState } from '../thermal';
import { type PointFigures, pointFigures } from './figures-over-time';
import { geometryOf, type TankShape } from './layers';

interface Memo {
  shape: string;
  first: number;
  last: number;
  check: StuckState;
  at: Map<number, PointFigures | null>;
}

/** The tank page's live raw windows reach back 24 h (raw is chosen up to 36 h); older figures are let go. */
const KEEP_MS = 36 * 3_600_000;
/** About 300 kB a tank with a 36-hour window: tanks staff have open, most recently used kept. */
const MAX_TANKS = 100;
const memos = new Map<string, Memo>();

/** The figures of a tank's raw readings (oldest first, one per row), from the memo where it has them. */
export function memoFigures(
  tankId: string,
  rows: readonly { t: number; layersC: readonly (number | null)[] }[],
  tank: TankShape & { sensorCount: number },
): (PointFigures | null)[] {
  const first = rows[0]?.t;
  if (first === undefined) return [];
  const geometry = geometryOf(tank);
  const shape = JSON.stringify(geometry);
  let m = memos.get(tankId);
  if (m && (m.shape !== shape || first < m.first || rows.some((r) => r.t <= m!.last && !m!.at.has(r.t)))) m = undefined;
  m ??= { shape, first, last: Number.NEGATIVE_INFINITY, check: initialStuck(tank.sensorCount), at: new Map() };

  const fresh = rows.filter((r) => r.t > m.last);
  if (fresh.length > 0) {
    const figures = figuresOverTime(fresh, geometry, { check: m.check });
    for (const [i, r] of fresh.entries()) m.at.set(r.t, pointFigures(figures[i] ?? null));
    m.last = fresh.at(-1)!.t;
  }
  // Entries are in time order (only newer ones are ever added), so the old ones are at the front.
  const horizon = m.last - KEEP_MS;
  if (m.first < horizon) {
    for (const t of m.at.keys()) {
      if (t >= horizon) break;
      m.at.delete(t);
    }
    m.first = horizon;
  }
  memos.delete(tankId);
  memos.set(tankId, m);
  if (memos.size > MAX_TANKS) memos.delete(memos.keys().next().value!);
  return rows.map((r) => m.at.get(r.t) ?? null);
}
