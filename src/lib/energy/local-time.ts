// Wall-clock time in a named time zone (IANA, e.g. "Europe/London"), for tariffs whose prices
// follow the local clock and for demand by hour of the local week. Uses the runtime's Intl data.
import { EnergyInputError } from './errors.js';

const formatters = new Map<string, Intl.DateTimeFormat>();
const offsets = new Map<string, Map<number, number>>();
// Zone offsets change at most on a quarter hour of UTC in every zone in use, so an offset looked up
// once per quarter hour is exact; the cache is dropped when it grows large.
const BUCKET_MS = 15 * 60 * 1000;
const CACHE_LIMIT = 200_000;

function formatter(timeZone: string): Intl.DateTimeFormat {
  let f = formatters.get(timeZone);
  if (!f) {
    try {
      f = new Intl.DateTimeFormat('en-GB', {
        timeZone,
        hourCycle: 'h23',
        year: 'numeric',
        month: '2-digit',
        day: '2-digit',
        hour: '2-digit',
        minute: '2-digit',
        second: '2-digit',
      });
    } catch {
      throw new EnergyInputError(
        'timeZone',
        `timeZone is ${timeZone}: it must be an IANA time-zone name such as Europe/London.`,
      );
    }
    formatters.set(timeZone, f);
  }
  return f;
}

/** True when `timeZone` is an IANA time-zone name the runtime knows. */
export function isTimeZone(timeZone: string): boolean {
  try {
    formatter(timeZone);
    return true;
  } catch {
    return false;
  }
}

function computeOffset(ms: number, timeZone: string): number {
  const parts = formatter(timeZone).formatToParts(new Date(ms));
  const get = (type: string): number => Number(parts.find((p) => p.type === type)!.value);
  const asUtc = Date.UTC(get('year'), get('month') - 1, get('day'), get('hour'), get('minute'), get('second'));
  return asUtc - Math.floor(ms / 1000) * 1000;
}

/** Offset of local time from UTC at instant `ms` (epoch ms), milliseconds (e.g. 3 600 000 in British Summer Time). */
function zoneOffsetMs(ms: number, timeZone: string): number {
  let zone = offsets.get(timeZone);
  if (!zone) offsets.set(timeZone, (zone = new Map()));
  const bucket = Math.floor(ms / BUCKET_MS);
  let off = zone.get(bucket);
  if (off === undefined) {
    off = computeOffset(bucket * BUCKET_MS, timeZone);
    if (zone.size > CACHE_LIMIT) zone.clear();
    zone.set(bucket, off);
  }
  return off;
}

const DAY_MS = 86_400_000;

/** Local wall-clock minutes after midnight at `ms` (epoch ms), 0–1439. */
export function localMinuteOfDay(ms: number, timeZone: string): number {
  const local = ms + zoneOffsetMs(ms, timeZone);
  return Math.floor((((local % DAY_MS) + DAY_MS) % DAY_MS) / 60_000);
}

/** Local hour of the week at `ms`: 0 is Monday 00:00–01:00, 167 is Sunday 23:00–24:00. */
export function localHourOfWeek(ms: number, timeZone: string): number {
  const local = ms + zoneOffsetMs(ms, timeZone);
  const day = Math.floor(local / DAY_MS);
  // 1970-01-01 was a Thursday (day 3 counting Monday as 0).
  const weekday = (((day + 3) % 7) + 7) % 7;
  const hour = Math.floor((local - day * DAY_MS) / 3_600_000);
  return weekday * 24 + hour;
}

/** Local calendar date at `ms`, "YYYY-MM-DD". */
export function localDate(ms: number, timeZone: string): string {
  return new Date(ms + zoneOffsetMs(ms, timeZone)).toISOString().slice(0, 10);
}

/**
 * The instants bounding local calendar day `date` ("YYYY-MM-DD") in `timeZone`: from local midnight
 * to the next local midnight, epoch ms (23 or 25 hours long on clock-change days).
 */
export function localDayBounds(date: string, timeZone: string): { startMs: number; endMs: number } {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(date);
  if (!m) throw new EnergyInputError('date', `date is ${date}: it must be a calendar date written YYYY-MM-DD.`);
  const midnight = (y: number, mo: number, d: number): number => {
    const wall = Date.UTC(y, mo - 1, d);
    let ms = wall - zoneOffsetMs(wall, timeZone);
    ms = wall - zoneOffsetMs(ms, timeZone); // second pass settles a clock change near midnight
    return ms;
  };
  const [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])];
  if (new Date(Date.UTC(y, mo - 1, d)).toISOString().slice(0, 10) !== date) {
    throw new EnergyInputError('date', `date is ${date}: no such calendar day.`);
  }
  return { startMs: midnight(y, mo, d), endMs: midnight(y, mo, d + 1) };
}
