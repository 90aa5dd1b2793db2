// A charge plan as the daily windows of a set_schedule command. Pure: no I/O.
//
// set_schedule carries at most 6 windows of local clock time in which the tank may heat (its own
// thermostat still decides within them). The plan's windows of either source over the first 24
// hours are folded onto the clock; when there are more than 6, the shortest gaps between them are
// closed first (heating a little longer is safer than leaving a planned charge out).
import { localMinuteOfDay } from '../energy';
import type { CommandWindow } from '../energy';

const MAX_SCHEDULE_WINDOWS = 6;
const DAY_MIN = 24 * 60;

const hhmm = (m: number): string =>
  `${String(Math.floor(m / 60) % 24).padStart(2, '0')}:${String(m % 60).padStart(2, '0')}`;

/**
 * Daily windows `{ from, to }` (local HH:MM, `to` exclusive, may wrap past midnight) from the plan's
 * windows that start within 24 h of `startMs`. An empty list means "heat at any time" to the tank,
 * so a plan that heats all day answers [], and a plan that never heats answers null (nothing to send).
 */
export function scheduleWindows(
  windows: readonly CommandWindow[],
  startMs: number,
  timeZone: string,
): { from: string; to: string }[] | null {
  const endMs = startMs + DAY_MIN * 60_000;
  // Intervals in minutes after startMs, clipped to the first day, merged across sources.
  const spans = windows
    .map((w) => [Math.max(Date.parse(w.start), startMs), Math.min(Date.parse(w.end), endMs)] as const)
    .filter(([a, b]) => b > a)
    .map(([a, b]) => [(a - startMs) / 60_000, (b - startMs) / 60_000] as [number, number])
    .sort((x, y) => x[0] - y[0]);
  const merged: [number, number][] = [];
  for (const s of spans) {
    const last = merged[merged.length - 1];
    if (last && s[0] <= last[1]) last[1] = Math.max(last[1], s[1]);
    else merged.push([s[0], s[1]]);
  }
  if (merged.length === 0) return null;
  // On the clock the last window may run into the first (past the same time tomorrow).
  if (merged.length > 1 && merged[merged.length - 1]![1] >= DAY_MIN && merged[0]![0] <= 0) {
    const first = merged.shift()!;
    merged[merged.length - 1]![1] += first[1];
  }
  while (merged.length > MAX_SCHEDULE_WINDOWS) {
    let best = 0;
    for (let k = 1; k + 1 < merged.length; k++)
      if (merged[k + 1]![0] - merged[k]![1] < merged[best + 1]![0] - merged[best]![1]) best = k;
    merged[best]![1] = merged[best + 1]![1];
    merged.splice(best + 1, 1);
  }
  if (merged.some(([a, b]) => b - a >= DAY_MIN)) return [];
  const startLocal = localMinuteOfDay(startMs, timeZone);
  return merged.map(([a, b]) => ({ from: hhmm((startLocal + a) % DAY_MIN), to: hhmm((startLocal + b) % DAY_MIN) }));
}
