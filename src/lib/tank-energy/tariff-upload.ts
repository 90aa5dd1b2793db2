// A tariff from the body of POST /api/tariffs: JSON for flat and day/night tariffs, CSV for
// half-hourly prices. Pure: either a normalised tariff or every problem, each naming its place.
import { parseHalfHourlyCsv, parseTariff } from '../energy';
import type { PriceUnit, Tariff } from '../energy';

/** One refusal: `row` is the CSV line (1 = header) for uploads, absent for JSON fields. */
export interface TariffProblem {
  row?: number;
  field: string;
  message: string;
}

export type TariffParse = { ok: true; tariff: Tariff } | { ok: false; problems: TariffProblem[] };

export function tariffFromJson(input: unknown): TariffParse {
  const r = parseTariff(input);
  return r.ok
    ? { ok: true, tariff: r.tariff }
    : { ok: false, problems: r.errors.map((e) => ({ field: `tariff.${e.field}`, message: e.message })) };
}

export function tariffFromCsv(
  text: string,
  options: { unit?: PriceUnit; name?: string; negativeImportAllowed?: boolean },
): TariffParse {
  const r = parseHalfHourlyCsv(text, options);
  return r.ok
    ? { ok: true, tariff: r.tariff }
    : { ok: false, problems: r.errors.map((e) => ({ row: e.row, field: e.field, message: e.message })) };
}
