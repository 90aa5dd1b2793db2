// The energy-day job (run by the ingest worker after the rollups): account each tank's local days
// that have ended and whose readings or tariffs changed, and store the figures in energy_days, so
// that fleet figures read one row per tank-day. A day is accounted exactly as the tank's own energy
// endpoint accounts it (accountDays on the same readings and tariffs).
import { localDate, localDayBounds } from '../energy';
import {
  energyReadingsIn,
  energyTanksById,
  pruneEnergyDays,
  saveEnergyDay,
  tariffsOfCompanies,
  withDirtyEnergyHours,
} from '../../db/queries/energy-days';
import { accountDays, readingWindow } from './account';
import { HOME_TIME_ZONE } from './contracts';
import { accountingTank, energyReadings, tankColdC } from './inputs';
import { homeTariffs } from './tariff-layers';

/** Stored days are kept this long: the fleet compares at most a year (a product limit). */
export const ENERGY_DAYS_KEPT = 400;

/** The local dates an hour [hourMs, hourMs + 1 h) touches (two where a zone's midnight falls inside it). */
function datesOf(hourMs: number, timeZone: string): string[] {
  const a = localDate(hourMs, timeZone);
  const b = localDate(hourMs + 3_600_000 - 1, timeZone);
  return a === b ? [a] : [a, b];
}

/**
 * Accounts the days of up to `limit` queued hours (hours that ended before today began at the
 * homes) in one transaction. Returns how many hours it took off the queue and how many tank-days
 * it wrote; `{ hours: 0 }` when nothing was due.
 */
export async function refreshEnergyDays(
  opts: { limit?: number; nowMs?: number } = {},
): Promise<{ hours: number; days: number }> {
  const nowMs = opts.nowMs ?? Date.now();
  const today = localDate(nowMs, HOME_TIME_ZONE);
  const cutoffMs = localDayBounds(today, HOME_TIME_ZONE).startMs;
  // An hour is due once it has ended before today's local midnight.
  const done = await withDirtyEnergyHours(cutoffMs - 3_600_000 + 1, opts.limit ?? 2000, async (tx, hours) => {
    const days = new Map<string, Set<string>>();
    for (const h of hours) {
      let set = days.get(h.tankId);
      if (!set) days.set(h.tankId, (set = new Set()));
      for (const d of datesOf(h.hourMs, HOME_TIME_ZONE)) set.add(d);
    }
    const tanks = await energyTanksById(tx, [...days.keys()]);
    const tariffs = await tariffsOfCompanies(tx, [...new Set(tanks.map((t) => t.companyId))]);
    let written = 0;
    for (const tank of tanks) {
      const own = tariffs.filter((r) => r.companyId === tank.companyId);
      const { tariffs: priced } = homeTariffs(own, tank.homeId);
      for (const date of [...days.get(tank.id)!].sort()) {
        const w = readingWindow(date, date, HOME_TIME_ZONE);
        const rows = await energyReadingsIn(tx, tank.id, w.startMs, w.endMs);
        const { days: accounted } = accountDays(
          energyReadings(rows, tank),
          accountingTank(tank),
          priced,
          date,
          date,
          HOME_TIME_ZONE,
          tankColdC(tank),
        );
        await saveEnergyDay(tx, tank, date, accounted[0] ?? null);
        written++;
      }
    }
    return { hours: hours.length, days: written };
  });
  return done ?? { hours: 0, days: 0 };
}

/** Catches up in slices so that no one transaction grows long (a backfill queues many days). */
export async function catchUpEnergyDays(maxSlices = 20): Promise<number> {
  let total = 0;
  for (let i = 0; i < maxSlices; i++) {
    const n = await refreshEnergyDays({ limit: 2000 });
    if (n.hours === 0) break;
    total += n.days;
  }
  return total;
}

export { pruneEnergyDays };
