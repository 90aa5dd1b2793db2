import type uPlot from 'uplot';
import { fontMono, tokens } from './tokens';

/** Axis styling shared by the charts (tokens only). */
export function axis(extra: Partial<uPlot.Axis> = {}): uPlot.Axis {
  return {
    stroke: tokens.ink.soft,
    font: fontMono,
    labelFont: fontMono,
    grid: { stroke: tokens.line.DEFAULT, width: 1 },
    ticks: { stroke: tokens.line.strong, width: 1 },
    ...extra,
  };
}

/** Time axis labels in the viewer's local time, day and month when the range spans days. */
export const timeAxis = (spanMs: number): uPlot.Axis =>
  axis({
    // Ranges of a few days: the day above the time (uPlot draws "\n" as a second line).
    values: (_u, splits) =>
      splits.map((s) => {
        const d = new Date(s * 1000);
        const day = d.toLocaleDateString('en-GB', { day: 'numeric', month: 'short' });
        const time = d.toLocaleTimeString('en-GB', { hour: '2-digit', minute: '2-digit' });
        return spanMs > 10 * 86_400_000 ? day : spanMs > 36 * 3_600_000 ? `${day}\n${time}` : time;
      }),
    size: 44,
  });
