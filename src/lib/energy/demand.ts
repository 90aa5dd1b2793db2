// Expected hot-water demand by local hour of the week, learned from a home's own draws and blended
// with a prior for a home with little or no history.
//
// Demand is counted as litres of mixed water at 40 °C (the V40 unit): a draw's heat above cold water
// divided by the heat in one litre at 40 °C.
//
// The prior: the EN 16147 / Regulation (EU) 814/2013 tapping cycle M (Qref 5.845 kWh/day), taken to
// describe a two-occupant home (from memory: the usual reading of profile M), scaled for other
// households by the daily hot-water volume rule of the UK Standard Assessment Procedure, SAP 2012
// Appendix J, V = 25·N + 36 litres/day (from memory), i.e. by (25·N + 36)/86. The same cycle serves
// every day of the week. Each draw counts in the hour it starts.
//
// Blending: for each hour of the week, (w·prior + Σ observed) / (w + weeks observed), where the
// weeks observed for an hour are the hours of readings that hour has had, and w (default 2 weeks) is
// how much history the prior is worth. A new home gets the prior; after w weeks, half and half.
import { tappingProfile, waterCp, waterDensity } from '../thermal/index.js';
import type { EnergyReading } from './accounting.js';
import { EnergyInputError } from './errors.js';
import { localHourOfWeek } from './local-time.js';
import { DEFAULT_COLD_C, J_PER_KWH, kWhPerLitreAt40 } from './units.js';
import { finite, nonNegative, positive, wholeIn } from './validate.js';

/** Hours in a week. */
export const HOURS_PER_WEEK = 168;

/** Expected demand of one home by local hour of week. */
export interface DemandModel {
  /** IANA zone of the household's clock. */ timeZone: string;
  /** Expected draw in each hour of the week (0 = Monday 00:00–01:00 local), litres at 40 °C. */ litres40ByHour: number[];
  /** Hours of history behind each hour of the week, in weeks (0 for a new home). */ weeksObserved: number[];
  /** The prior, litres at 40 °C per hour of the week. */ prior: number[];
}

/** Scale of the SAP 2012 Appendix J daily volume for `occupants` against a two-person home: (25·N + 36)/86. */
export function occupantScale(occupants: number): number {
  const n = positive('occupants', occupants, 'people');
  return (25 * n + 36) / 86;
}

/** Prior demand of a home with `occupants` people, litres at 40 °C per local hour of week (168 values). */
export function demandPrior(occupants: number): number[] {
  const scale = occupantScale(occupants);
  const perLitre = kWhPerLitreAt40(DEFAULT_COLD_C);
  const day = new Array<number>(24).fill(0);
  for (const d of tappingProfile('M').draws) day[Math.floor(d.minuteOfDay / 60)]! += (d.energyKWh * scale) / perLitre;
  return Array.from({ length: HOURS_PER_WEEK }, (_, h) => day[h % 24]!);
}

/** Options of {@link learnDemand}. */
export interface LearnDemandOptions {
  /** People living in the home (for the prior). */ occupants: number;
  /** IANA zone of the household's clock (default Europe/London). */ timeZone?: string;
  /** Cold-water temperature, °C (default 10). */ coldC?: number;
  /** Weight of the prior in weeks of history (default 2). */ priorWeeks?: number;
  /** Intervals between readings longer than this are not history, ms (default 5 min). */ maxGapMs?: number;
}

/**
 * Learn expected demand from a home's readings (sorted by time; only `ts`, the top layer and `drawLpm`
 * are used): each interval's draw, counted as litres at 40 °C, goes to the local hour of week of its
 * start, and the interval's length counts as history for that hour.
 */
export function learnDemand(readings: readonly EnergyReading[], options: LearnDemandOptions): DemandModel {
  const timeZone = options.timeZone ?? 'Europe/London';
  const coldC = finite('options.coldC', options.coldC ?? DEFAULT_COLD_C, '°C');
  const w = nonNegative('options.priorWeeks', options.priorWeeks ?? 2, 'weeks');
  const maxGapMs = positive('options.maxGapMs', options.maxGapMs ?? 300_000, 'ms');
  const prior = demandPrior(options.occupants);
  const litres = new Array<number>(HOURS_PER_WEEK).fill(0);
  const hours = new Array<number>(HOURS_PER_WEEK).fill(0);
  const perLitre = kWhPerLitreAt40(coldC);
  for (let i = 0; i + 1 < readings.length; i++) {
    const r = readings[i]!;
    const dtMs = readings[i + 1]!.ts - r.ts;
    if (!(dtMs > 0))
      throw new EnergyInputError(
        `readings[${i + 1}].ts`,
        `readings[${i + 1}].ts is not after the reading before it: readings must be sorted by time without duplicates.`,
      );
    if (dtMs > maxGapMs) continue;
    const h = localHourOfWeek(r.ts, timeZone);
    hours[h]! += dtMs / 3_600_000;
    const lpm = r.drawLpm ?? 0;
    if (lpm > 0) {
      const top = r.layersC[r.layersC.length - 1]!;
      const kWh =
        (((lpm * dtMs) / 60_000 / 1000) * waterDensity(top) * waterCp((top + coldC) / 2) * Math.max(0, top - coldC)) /
        J_PER_KWH;
      litres[h]! += kWh / perLitre;
    }
  }
  const litres40ByHour = prior.map((p, h) => (w + hours[h]! > 0 ? (w * p + litres[h]!) / (w + hours[h]!) : p));
  return { timeZone, litres40ByHour, weeksObserved: hours, prior };
}

/**
 * Expected demand for `steps` consecutive steps of `stepMin` minutes (a divisor of 60) from `startMs`,
 * litres at 40 °C per step: each hour's expectation shared evenly by the steps in it.
 */
export function demandSeries(model: DemandModel, startMs: number, steps: number, stepMin = 30): number[] {
  wholeIn('steps', steps, 1, 7 * 24 * 60);
  if (60 % stepMin !== 0)
    throw new EnergyInputError('stepMin', `stepMin is ${stepMin}: it must divide an hour (5, 10, 15, 20, 30 or 60).`);
  const out = new Array<number>(steps);
  for (let i = 0; i < steps; i++) {
    const ms = startMs + i * stepMin * 60_000;
    out[i] = (model.litres40ByHour[localHourOfWeek(ms, model.timeZone)]! * stepMin) / 60;
  }
  return out;
}
