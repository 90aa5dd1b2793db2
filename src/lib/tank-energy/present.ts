// Shaping energy and plan answers for the views: money in plain words, chart columns. Pure.
import { kWhPerLitreAt40 } from '../energy/units';
import type { PlanResponse } from './contracts';

/** Below this much solar heat a week there is nothing worth telling a householder, kWh (a few minutes of an element). */
const SOLAR_WORTH_SAYING_KWH = 0.05;

/**
 * The householder's sentence about free heat from their solar panels, in litres of warm water (no
 * energy units on that page), or null when there was none worth mentioning. Litres at 40 °C from
 * 10 °C mains, the EN 16147 V40 reference.
 */
export function solarSentence(solarHeatKWh: number, days: number): string | null {
  if (!(solarHeatKWh >= SOLAR_WORTH_SAYING_KWH)) return null;
  const litres = Math.max(1, Math.round(solarHeatKWh / kWhPerLitreAt40(10)));
  const over = days === 1 ? 'the last day' : `the last ${days} days`;
  return `Your solar panels heated about ${litres} litre${litres === 1 ? '' : 's'} of it for free over ${over}, with spare power that would otherwise have gone to the grid.`;
}

/** Pence as people say it: "45p" under a pound, "£3.20" from a pound. */
export function fmtMoney(pence: number): string {
  const p = Math.round(pence);
  if (Math.abs(p) < 100) return `${p}p`;
  return `${p < 0 ? '−' : ''}£${(Math.abs(p) / 100).toFixed(2)}`;
}

/** Columns of the plan chart: step starts, price, planned heating, expected V40 of plan and fixed schedule, floor. */
export function planColumns(plan: PlanResponse): {
  t: number[];
  price: number[];
  v40: number[];
  baselineV40: number[];
  floor: number[];
  heating: (number | null)[];
} {
  const t = plan.steps.map((s) => s.startMs);
  return {
    t,
    price: plan.steps.map((s) => s.importPence),
    v40: plan.steps.map((s) => s.expectedV40),
    baselineV40: plan.baselineV40,
    floor: plan.steps.map(() => plan.comfortFloorL40),
    // A thick bar along the floor line while a source runs: each heating step draws from its start to
    // the next step's start (its end), so a single half hour shows as a segment, not a lone point.
    heating: plan.steps.map((s, i) => {
      const prev = plan.steps[i - 1];
      return s.heatPump || s.immersion || (prev && (prev.heatPump || prev.immersion)) ? plan.comfortFloorL40 : null;
    }),
  };
}
