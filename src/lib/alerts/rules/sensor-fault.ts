// Sensor faults: a value out of the physical range (or none: the device reports an open or shorted
// sensor as null), a sensor stuck while its neighbours move, or a lower sensor warmer than the one
// above it by more than buoyant mixing allows (swapped or misplaced sensors). Each check has its
// own persistence so that a single odd reading raises nothing. Pure: no I/O.
import { stepStuck } from '../../thermal';
import type { Reading } from '../../telemetry/wire';
import type { Thresholds } from '../thresholds';
import { MAX_GAP_MS, MIN, clear, fmtTime, round1, sample, type Finding } from './common';

export interface SensorState {
  prevTs: number | null;
  /** Per sensor: since when it has been out of range (or missing). */
  badSince: (number | null)[];
  /** Per pair (i, i+1): since when sensor i has read warmer than sensor i+1 beyond the limit. */
  inversionSince: (number | null)[];
  /** The stuck check's current window: its start and each sensor's lowest and highest value. */
  window: { start: number; min: (number | null)[]; max: (number | null)[] } | null;
  /** Per sensor, from the last window that could tell: stuck (true), moving (false), or not yet known. */
  stuck: (boolean | null)[];
  /** The stuck value and the neighbour's movement behind each stuck verdict. */
  stuckDetail: ({ rangeK: number; neighbourK: number; at: number } | null)[];
  last: ReturnType<typeof sample> | null;
}

export function initialSensor(n: number): SensorState {
  return {
    prevTs: null,
    badSince: new Array(n).fill(null),
    inversionSince: new Array(Math.max(0, n - 1)).fill(null),
    window: null,
    stuck: new Array(n).fill(null),
    stuckDetail: new Array(n).fill(null),
    last: null,
  };
}

export function stepSensor(s: SensorState, r: Reading, th: Thresholds): void {
  const L = r.layersC;
  const n = L.length;
  if (s.badSince.length !== n) Object.assign(s, initialSensor(n));
  if (s.prevTs !== null && r.ts - s.prevTs > MAX_GAP_MS) {
    s.badSince.fill(null);
    s.inversionSince.fill(null);
    s.window = null;
  }
  for (let i = 0; i < n; i++) {
    const v = L[i];
    const bad = v === null || v === undefined || v < th.sensorMinC || v > th.sensorMaxC;
    s.badSince[i] = bad ? (s.badSince[i] ?? r.ts) : null;
  }
  for (let i = 0; i + 1 < n; i++) {
    const below = L[i];
    const above = L[i + 1];
    const inverted = below != null && above != null && below - above > th.sensorInversionK;
    s.inversionSince[i] = inverted ? (s.inversionSince[i] ?? r.ts) : null;
  }
  // Stuck: the thermal core's check (the figures use it too), with this company's limits.
  stepStuck(s, r.ts, L, {
    windowMin: th.sensorStuckWindowMin,
    toleranceK: th.sensorStuckToleranceK,
    neighbourMoveK: th.sensorNeighbourMoveK,
    maxGapMs: MAX_GAP_MS,
  });
  s.prevTs = r.ts;
  s.last = sample(r);
}

/** Which problems show right now, without waiting for persistence (other rules stop trusting the column at once). */
export function sensorSuspect(s: SensorState): boolean {
  return (
    s.badSince.some((x) => x !== null) || s.inversionSince.some((x) => x !== null) || s.stuck.some((x) => x === true)
  );
}

export function sensorFinding(s: SensorState, at: number, th: Thresholds): Finding {
  const problems: string[] = [];
  const facts: Record<string, number | string | boolean | null> = {};
  let since = Infinity;
  s.badSince.forEach((from, i) => {
    if (from === null || at - from < th.sensorRangeMin * MIN) return;
    const v = s.last?.layersC[i];
    problems.push(
      v === null || v === undefined
        ? `sensor ${i + 1} (from the bottom) gives no reading since ${fmtTime(from)}`
        : `sensor ${i + 1} reads ${v.toFixed(1)} °C, outside ${th.sensorMinC}–${th.sensorMaxC} °C`,
    );
    facts[`sensor${i + 1}`] = v === undefined ? null : v;
    since = Math.min(since, from + th.sensorRangeMin * MIN);
  });
  s.inversionSince.forEach((from, i) => {
    if (from === null || at - from < th.sensorInversionMin * MIN) return;
    const below = s.last?.layersC[i];
    const above = s.last?.layersC[i + 1];
    const dk = below != null && above != null ? below - above : null;
    problems.push(
      `sensor ${i + 1} reads ${dk === null ? 'more' : `${dk.toFixed(1)} K`} warmer than sensor ${i + 2} above it for ${Math.round((at - from) / MIN)} min (swapped or misplaced sensors?)`,
    );
    facts[`inversion${i + 1}_${i + 2}K`] = dk === null ? null : round1(dk);
    since = Math.min(since, from + th.sensorInversionMin * MIN);
  });
  s.stuck.forEach((stuck, i) => {
    const d = s.stuckDetail[i];
    if (!stuck || !d) return;
    problems.push(
      `sensor ${i + 1} has not changed (by ${d.rangeK} K) in ${th.sensorStuckWindowMin} min while a neighbour moved ${d.neighbourK} K`,
    );
    facts[`stuck${i + 1}`] = s.last?.layersC[i] ?? null;
    since = Math.min(since, d.at);
  });
  if (problems.length === 0) return clear;
  facts.inversionLimitK = th.sensorInversionK;
  const sentence = problems.join('; ');
  return {
    active: true,
    since: Number.isFinite(since) ? since : at,
    evidence: {
      summary: `${sentence.charAt(0).toUpperCase() + sentence.slice(1)}.`,
      facts,
      readings: s.last ? [s.last] : [],
      at,
    },
  };
}
