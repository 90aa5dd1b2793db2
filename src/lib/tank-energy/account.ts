// A tank's energy and cost for a run of local calendar days, and their months. Pure: no I/O.
import { accountDay, localDate, localDayBounds, rollUpMonths } from '../energy';
import type { AccountingTank, DayEnergy, EnergyReading, MonthEnergy, Tariffs } from '../energy';

/** The calendar dates from `from` to `to` inclusive ("YYYY-MM-DD"). */
function datesBetween(from: string, to: string): string[] {
  const out: string[] = [];
  for (let ms = Date.parse(`${from}T00:00:00Z`); ms <= Date.parse(`${to}T00:00:00Z`); ms += 86_400_000) {
    out.push(new Date(ms).toISOString().slice(0, 10));
  }
  return out;
}

/** The instant range the readings must cover for these days (one interval past the end closes the last). */
export function readingWindow(
  from: string,
  to: string,
  timeZone: string,
  closeMs = 5 * 60_000,
): { startMs: number; endMs: number } {
  return { startMs: localDayBounds(from, timeZone).startMs, endMs: localDayBounds(to, timeZone).endMs + closeMs };
}

/**
 * One DayEnergy for each day from `from` to `to` that has two or more readings (days without
 * telemetry are left out, not reported as zero), and the months those days fall in. `readings`
 * sorted by time, as from {@link readingWindow}; `coldC` the home's cold water (default EN 16147's).
 */
export function accountDays(
  readings: readonly EnergyReading[],
  tank: AccountingTank,
  tariffs: Tariffs,
  from: string,
  to: string,
  timeZone: string,
  coldC?: number,
): { days: DayEnergy[]; months: MonthEnergy[] } {
  const days: DayEnergy[] = [];
  let i = 0;
  for (const date of datesBetween(from, to)) {
    const { startMs, endMs } = localDayBounds(date, timeZone);
    while (i < readings.length && readings[i]!.ts < startMs) i++;
    let j = i;
    while (j < readings.length && readings[j]!.ts < endMs) j++;
    // The first reading after the day closes its last interval.
    const slice = readings.slice(i, Math.min(j + 1, readings.length));
    if (slice.length >= 2 && localDate(slice[0]!.ts, timeZone) === date)
      days.push(accountDay(slice, tank, tariffs, { startMs, endMs, date, ...(coldC === undefined ? {} : { coldC }) }));
    i = j;
  }
  return { days, months: rollUpMonths(days) };
}
