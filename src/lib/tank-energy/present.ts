// Shaping energy and plan answers for the views: money in plain words, chart columns. Pure.
import type { PlanResponse } from './contracts';

/** Pence as people say it: "45p" under a pound, "£3.20" from a pound. */
export function fmtMoney(pence: number): string {
  const p = Math.round(pence);
  if (Math.abs(p) < 100) return `${p}p`;
  return `${p < 0 ? '−' : ''}£${(Math.abs(p) / 100).toFixed(2)}`;
}

/** Columns of the plan chart: step starts, price, planned heating, expected V40 of plan and fixed schedule, floor. */
export function planColumns(plan: PlanResponse): { t: number[]; price: number[]; v40: number[]; baselineV40: number[]; floor: number[]; heating: (number | null)[] } {
  const t = plan.steps.map((s) => s.startMs);
  return {
    t,
    price: plan.steps.map((s) => s.importPence),
    v40: plan.steps.map((s) => s.expectedV40),
    baselineV40: plan.baselineV40,
    floor: plan.steps.map(() => plan.comfortFloorL40),
    // Drawn at the floor line while a source runs, gaps elsewhere: a bar of "heating" along the chart.
    heating: plan.steps.map((s) => (s.heatPump || s.immersion ? plan.comfortFloorL40 : null)),
  };
}
