// Not enough hot water ahead of the household's usual demand: the cylinder's V40 now is less than
// what the home usually draws over the next hours. Usual demand is the energy core's demand by
// hour of the week (learnDemand), kept as running sums per hour so that each batch only adds to
// it; blended with the energy core's prior exactly as learnDemand blends (2 weeks of weight).
// Pure: no I/O.
import { demandPrior, demandSeries, learnDemand, HOURS_PER_WEEK, type DemandModel } from '../../energy';
import type { Reading } from '../../telemetry/wire';
import type { Thresholds } from '../thresholds';
import { MAX_GAP_MS, MIN, clear, round1, sample, type Finding } from './common';

const PRIOR_WEEKS = 2;
const TIME_ZONE = 'Europe/London';

export interface LowHotWaterState {
  /** Litres at 40 °C drawn and hours of readings, per local hour of the week. */
  litres: number[];
  hours: number[];
  prev: { ts: number; layersC: number[]; drawLpm?: number } | null;
  v40L: number | null;
  expected: { at: number; litres: number } | null;
  last: ReturnType<typeof sample> | null;
}

export const initialLowHotWater = (): LowHotWaterState => ({
  litres: new Array(HOURS_PER_WEEK).fill(0),
  hours: new Array(HOURS_PER_WEEK).fill(0),
  prev: null,
  v40L: null,
  expected: null,
  last: null,
});

/**
 * Adds a batch's draws to the demand sums (the energy core learns; we keep its sums). `columns[i]`:
 * reading i's layers from the tank's figures (null when withheld: the reading is skipped).
 */
export function learnFromBatch(
  s: LowHotWaterState,
  readings: readonly Reading[],
  columns: readonly (readonly number[] | null)[],
  occupants: number,
): void {
  const series: { ts: number; layersC: number[]; drawLpm?: number }[] = [];
  if (s.prev && readings.length > 0 && readings[0]!.ts - s.prev.ts <= MAX_GAP_MS) series.push(s.prev);
  for (const [i, r] of readings.entries()) {
    const layers = columns[i];
    if (layers)
      series.push({ ts: r.ts, layersC: [...layers], ...(r.drawLpm !== undefined ? { drawLpm: r.drawLpm } : {}) });
  }
  if (series.length >= 2) {
    const m = learnDemand(series, { occupants, priorWeeks: 0, timeZone: TIME_ZONE });
    for (let h = 0; h < HOURS_PER_WEEK; h++) {
      if (m.weeksObserved[h]! > 0) {
        s.litres[h]! += m.litres40ByHour[h]! * m.weeksObserved[h]!;
        s.hours[h]! += m.weeksObserved[h]!;
      }
    }
  }
  if (series.length > 0) s.prev = series[series.length - 1]!;
}

const priors = new Map<number, number[]>();

function demandModel(s: LowHotWaterState, occupants: number): DemandModel {
  let prior = priors.get(occupants);
  if (!prior) priors.set(occupants, (prior = demandPrior(occupants)));
  return {
    timeZone: TIME_ZONE,
    prior,
    weeksObserved: [...s.hours],
    litres40ByHour: prior.map((p, h) => (PRIOR_WEEKS * p + s.litres[h]!) / (PRIOR_WEEKS + s.hours[h]!)),
  };
}

/** V40 now: the tank's figure (a doubted sensor estimated; withheld figures, null, give no finding). */
export function stepLowHotWater(s: LowHotWaterState, r: Reading, v40L: number | null): void {
  s.v40L = v40L;
  s.last = sample(r);
}

export function lowHotWaterFinding(
  s: LowHotWaterState,
  at: number,
  th: Thresholds,
  occupants: number,
  trusted: boolean,
): Finding {
  if (!trusted || s.v40L === null) return { active: null };
  // Usual demand changes by the hour: work it out at most every quarter of an hour.
  if (!s.expected || at - s.expected.at >= 15 * MIN || at < s.expected.at) {
    const steps = demandSeries(demandModel(s, occupants), at, th.lowHotWaterLookaheadH * 2, 30);
    s.expected = { at, litres: steps.reduce((a, b) => a + b, 0) };
  }
  const expected = s.expected.litres;
  if (expected < th.lowHotWaterMinDemandL || s.v40L >= expected) return clear;
  return {
    active: true,
    evidence: {
      summary: `About ${Math.round(s.v40L)} L of hot water at 40 °C is stored, but the home usually uses about ${Math.round(expected)} L in the next ${th.lowHotWaterLookaheadH} h.`,
      facts: { v40L: round1(s.v40L), usualDemandL: round1(expected), lookaheadH: th.lowHotWaterLookaheadH },
      readings: s.last ? [s.last] : [],
      at,
    },
  };
}
