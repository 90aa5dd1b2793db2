// The part of the energy core the browser may import (React islands): tariff schemas, prices and
// the home's clock. The rest of the core goes through index.ts; it reaches csv-parse, which needs
// Node's Buffer and would stop an island from hydrating.
export { HALF_HOUR_MS, kWhPerLitreAt40 } from './units.js';
export {
  localMinuteOfDay,
  localHourOfWeek,
  localDate,
  localDayBounds,
} from './local-time.js';
export {
  parseTariff,
  priceAt,
} from './tariff.js';
export type {
  PriceUnit,
  FlatTariff,
  DayNightTariff,
  HalfHourlyTariff,
  Tariff,
  TariffLayers,
  Tariffs,
  Price,
  FieldError,
} from './tariff.js';
