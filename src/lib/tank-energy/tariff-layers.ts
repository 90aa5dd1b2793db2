// Which stored tariffs price a home. Pure: no I/O.
import type { Tariff, TariffLayers } from '../energy';

/** A stored tariff as far as choosing it goes (rows of the tariffs table). */
export interface StoredTariff {
  homeId: string | null;
  prices: Tariff;
  validFrom: Date;
  createdAt: Date;
}

export type TariffSource = 'home' | 'company' | 'none';

/**
 * The home's own tariffs where one is in force, the company defaults at other times (the energy
 * core's TariffLayers); `rows` may hold other homes' tariffs, which are ignored. Each list goes oldest
 * first, so that priceAt's "latest start wins" also breaks ties by the order they were entered.
 * `source` says whether the home has tariffs of its own at all.
 */
export function homeTariffs(
  rows: readonly StoredTariff[],
  homeId: string | null,
): { source: TariffSource; tariffs: TariffLayers } {
  const byAge = [...rows].sort(
    (a, b) => a.validFrom.getTime() - b.validFrom.getTime() || a.createdAt.getTime() - b.createdAt.getTime(),
  );
  const own = homeId === null ? [] : byAge.filter((r) => r.homeId === homeId).map((r) => r.prices);
  const defaults = byAge.filter((r) => r.homeId === null).map((r) => r.prices);
  return {
    source: own.length > 0 ? 'home' : defaults.length > 0 ? 'company' : 'none',
    tariffs: { layers: [own, defaults] },
  };
}
