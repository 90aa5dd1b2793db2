// Which sensors of a column can be believed: missing or out of range (an open or shorted
// thermistor), out of order (a lower sensor warmer than the one above beyond what buoyancy allows:
// swapped or misplaced sensors), or stuck (unchanged while a neighbour moves). The sensor-fault
// alert rule adds persistence on top of these checks; the figures leave the doubted sensors out.
// Pure: no I/O.

/** Limits of the checks; the alert thresholds' defaults are the usual ones. */
export interface SensorLimits {
  /** Lowest plausible water temperature, °C. */ minC: number;
  /** Highest plausible water temperature, °C. */ maxC: number;
  /** A lower sensor warmer than the one above by more than this, K, is out of order. */ inversionK: number;
}

/** The sensor-fault rule's default limits (src/lib/alerts/thresholds.ts gives their sources). */
export const DEFAULT_SENSOR_LIMITS: SensorLimits = { minC: 1, maxC: 99, inversionK: 3 };

export type SensorFault = 'missing' | 'out_of_range' | 'stuck' | 'out_of_order';

/** True when a value is missing or outside the plausible range. */
function implausible(v: number | null | undefined, limits: SensorLimits): boolean {
  return v === null || v === undefined || !Number.isFinite(v) || v < limits.minC || v > limits.maxC;
}

/** True when the lower of two adjacent readings is warmer than the upper beyond the limit. */
function inverted(below: number | null | undefined, above: number | null | undefined, limits: SensorLimits): boolean {
  return below != null && above != null && below - above > limits.inversionK;
}

/**
 * Each sensor's fault in one reading (null: believed), bottom to top, for `count` sensors (a
 * shorter reading leaves the rest missing). `stuck` lists sensors (0-based) a stuck check over
 * time has judged. Out of order: among the remaining sensors, the fewest are left out so that no
 * kept sensor reads warmer than the next kept one above it beyond `inversionK` (a longest chain,
 * found by dynamic programming over at most a few dozen sensors); on a tie the top sensor is
 * kept, since the top decides how much hot water there is.
 */
export function sensorFaults(
  layersC: readonly (number | null | undefined)[],
  count: number,
  limits: SensorLimits,
  stuck: readonly number[] = [],
): (SensorFault | null)[] {
  const faults: (SensorFault | null)[] = [];
  for (let i = 0; i < count; i++) {
    const v = layersC[i];
    faults.push(
      v === null || v === undefined
        ? 'missing'
        : implausible(v, limits)
          ? 'out_of_range'
          : stuck.includes(i)
            ? 'stuck'
            : null,
    );
  }
  const kept = faults.flatMap((f, i) => (f === null ? [i] : []));
  let anyInversion = false;
  for (let k = 0; k + 1 < kept.length; k++)
    if (inverted(layersC[kept[k]!], layersC[kept[k + 1]!], limits)) anyInversion = true;
  if (!anyInversion) return faults;
  // best[k]: longest chain of kept sensors ending at kept[k]; prev[k]: the one before it.
  const best: number[] = [];
  const prev: number[] = [];
  for (let k = 0; k < kept.length; k++) {
    best.push(1);
    prev.push(-1);
    for (let j = k - 1; j >= 0; j--) {
      if (inverted(layersC[kept[j]!], layersC[kept[k]!], limits)) continue;
      if (best[j]! + 1 > best[k]!) {
        best[k] = best[j]! + 1;
        prev[k] = j;
      }
    }
  }
  let end = kept.length - 1;
  for (let k = kept.length - 1; k >= 0; k--) if (best[k]! > best[end]!) end = k;
  const chain = new Set<number>();
  for (let k = end; k >= 0; k = prev[k]!) chain.add(kept[k]!);
  for (const i of kept) if (!chain.has(i)) faults[i] = 'out_of_order';
  return faults;
}

/** Limits of the stuck check. */
export interface StuckLimits {
  /** Window length, minutes. */ windowMin: number;
  /** A sensor changing less than this over the window, K, … */ toleranceK: number;
  /** … while a neighbour moved at least this, K, is stuck. */ neighbourMoveK: number;
  /** A silence longer than this, ms, starts the window afresh. */ maxGapMs: number;
}

/** The sensor-fault rule's defaults (src/lib/alerts/thresholds.ts). */
export const DEFAULT_STUCK_LIMITS: StuckLimits = {
  windowMin: 120,
  toleranceK: 0.05,
  neighbourMoveK: 2,
  maxGapMs: 15 * 60_000,
};

export interface StuckState {
  prevTs: number | null;
  /** The current window: its start and each sensor's lowest and highest value. */
  window: { start: number; min: (number | null)[]; max: (number | null)[] } | null;
  /** Per sensor, from the last window that could tell: stuck (true), moving (false), or not yet known. */
  stuck: (boolean | null)[];
  /** The stuck value's range and the neighbour's movement behind each stuck verdict. */
  stuckDetail: ({ rangeK: number; neighbourK: number; at: number } | null)[];
}

export const initialStuck = (n: number): StuckState => ({
  prevTs: null,
  window: null,
  stuck: new Array(n).fill(null),
  stuckDetail: new Array(n).fill(null),
});

const round1 = (x: number) => Math.round(x * 10) / 10;

/**
 * Advances the stuck check by one reading (in time order): tumbling windows of `windowMin`; a
 * sensor is judged only when a neighbour moved enough to tell, and cleared once it moves itself.
 */
export function stepStuck(
  s: StuckState,
  ts: number,
  layersC: readonly (number | null | undefined)[],
  limits: StuckLimits,
): void {
  const n = layersC.length;
  if (s.stuck.length !== n) Object.assign(s, initialStuck(n));
  if (s.prevTs !== null && ts - s.prevTs > limits.maxGapMs) s.window = null;
  s.prevTs = ts;
  if (!s.window) {
    s.window = { start: ts, min: layersC.map((v) => v ?? null), max: layersC.map((v) => v ?? null) };
    return;
  }
  const w = s.window;
  for (let i = 0; i < n; i++) {
    const v = layersC[i];
    if (v === null || v === undefined) continue;
    w.min[i] = w.min[i] === null ? v : Math.min(w.min[i]!, v);
    w.max[i] = w.max[i] === null ? v : Math.max(w.max[i]!, v);
  }
  if (ts - w.start < limits.windowMin * 60_000) return;
  const range = w.min.map((lo, i) => (lo === null || w.max[i] === null ? null : w.max[i]! - lo));
  for (let i = 0; i < n; i++) {
    const own = range[i];
    const neighbour = Math.max(range[i - 1] ?? 0, range[i + 1] ?? 0);
    if (own === null || own === undefined) continue;
    if (neighbour >= limits.neighbourMoveK) {
      s.stuck[i] = own <= limits.toleranceK;
      s.stuckDetail[i] = s.stuck[i] ? { rangeK: round1(own * 100) / 100, neighbourK: round1(neighbour), at: ts } : null;
    } else if (own > limits.toleranceK) {
      s.stuck[i] = false; // it moved: not stuck, whatever the neighbours did
      s.stuckDetail[i] = null;
    }
  }
  s.window = null;
}

/** Sensors (0-based) the stuck check currently holds stuck. */
export const stuckSensors = (s: StuckState | null | undefined): number[] =>
  s ? s.stuck.flatMap((x, i) => (x === true ? [i] : [])) : [];
