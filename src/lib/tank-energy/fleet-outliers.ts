// How the desk's fleet energy figures pick out homes that stand apart: Tukey's fences on each
// home's cost per litre of warm water drawn and on its DHW COP over the chosen days. Pure: the rule
// and its settings, which the SQL in src/db/queries/energy-days.ts applies to the stored days.
//
// Tukey's fences (J. W. Tukey, Exploratory Data Analysis, Addison-Wesley, 1977): with Q1 and Q3 the
// lower and upper quartiles and IQR = Q3 − Q1, a value below Q1 − k·IQR or above Q3 + k·IQR is an
// outlier, k = 1.5. Quartiles here are linearly interpolated (PostgreSQL's percentile_cont, the same
// as Hyndman & Fan's type 7, "Sample quantiles in statistical packages", The American Statistician
// 50 (1996) 361–365), which differs slightly from Tukey's own hinges; common practice.

export const outlierRule = {
  method: 'tukey',
  /** Fence multiplier (Tukey 1977). */
  k: 1.5,
  /** A home needs this many accounted days in the range to be compared (common practice: a few days smooth out one odd day). */
  minDays: 3,
  /**
   * Cost per litre is only compared for homes drawing at least this much a day on average, litres at
   * 40 °C: far below the smallest EN 16147 load profile (XXS, 2.1 kWh a day ≈ 60 L at 40 °C), so
   * below it the home was mostly away and the ratio says nothing (common practice).
   */
  minLitres40PerDay: 15,
  /** DHW COP is only compared where the heat pump used at least this much electricity a day on average, kWh (common practice). */
  minHeatPumpKWhPerDay: 0.2,
  /** Fewer homes than this with a figure give no fences (quartiles of four numbers say little; common practice). */
  minHomes: 5,
  /** Outliers listed per figure, the furthest beyond its fence first. */
  maxListed: 50,
} as const;

export type OutlierMetric = 'cost_per_100l' | 'dhw_cop';

/** A figure's spread across the fleet and its fences; null where too few homes have the figure. */
export interface Fence {
  homes: number;
  q1: number;
  median: number;
  q3: number;
  low: number;
  high: number;
}

export function fence(homes: number, q: readonly [number, number, number] | null, k = outlierRule.k): Fence | null {
  if (!q || homes < outlierRule.minHomes) return null;
  const [q1, median, q3] = q;
  const iqr = q3 - q1;
  return { homes, q1, median, q3, low: q1 - k * iqr, high: q3 + k * iqr };
}
