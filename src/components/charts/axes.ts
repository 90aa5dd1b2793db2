import type uPlot from 'uplot';
import { fontMono, tokens } from './tokens';

/** Axis styling shared by the charts (tokens only). */
export function axis(extra: Partial<uPlot.Axis> = {}): uPlot.Axis {
  return {
    stroke: tokens.ink.soft, font: fontMono, labelFont: fontMono,
    grid: { stroke: tokens.line.DEFAULT, width: 1 }, ticks: { stroke: tokens.line.strong, width: 1 },
    ...extra,
  };
}

/** Time axis labels in the viewer's local time, day and month when the range spans days. */
export const timeAxis = (spanMs: number): uPlot.Axis => axis({
  values: (_u, splits) => splits.map((s) => new Date(s * 1000).toLocaleString('en-GB', spanMs > 10 * 86_400_000 ? { day: 'numeric', month: 'short' } : spanMs > 36 * 3_600_000 ? { day: 'numeric', month: 'short', hour: '2-digit', minute: '2-digit' } : { hour: '2-digit', minute: '2-digit' })),
});
