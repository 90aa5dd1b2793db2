// The tariff forms (a home's own, and the company defaults) as typed, turned into the tariff JSON
// the API takes and checked by the same schema. Pure and browser-safe.
import { z } from '@/lib/zod';
import { HOME_TIME_ZONE } from '../tank-energy/contracts';
import { parseTariff } from './tariff';
import { localDayBounds } from './local-time';

export interface TariffForm {
  kind: 'flat' | 'day_night';
  name: string;
  unit: string;
  import: string;
  dayImport: string;
  nightImport: string;
  nightStart: string;
  nightEnd: string;
  export: string;
  validFrom: string;
  validTo: string;
}

export const emptyTariffForm = (today: string): TariffForm => ({
  kind: 'day_night',
  name: '',
  unit: 'p/kWh',
  import: '',
  dayImport: '',
  nightImport: '',
  nightStart: '00:30',
  nightEnd: '05:30',
  export: '',
  validFrom: today,
  validTo: '',
});

/** A number field as typed: blank is "not given", anything else must read as a number. */
const numberOrRaw = (s: string): number | string | undefined =>
  s.trim() === '' ? undefined : Number.isFinite(Number(s)) ? Number(s) : s;
/** A date field as the start of that day at the home. */
const dayStart = (d: string) => (d ? new Date(localDayBounds(d, HOME_TIME_ZONE).startMs).toISOString() : undefined);
/** The end of the last day a tariff applies (exclusive): the start of the next day at the home. */
const dayEnd = (d: string) => new Date(localDayBounds(d, HOME_TIME_ZONE).endMs).toISOString();

/** The tariff JSON the API takes, from what was typed. */
export function tariffOf(f: TariffForm): Record<string, unknown> {
  const common = {
    kind: f.kind,
    ...(f.name.trim() ? { name: f.name.trim() } : {}),
    unit: f.unit,
    export: numberOrRaw(f.export) ?? 0,
    validFrom: dayStart(f.validFrom),
    validTo: f.validTo ? dayEnd(f.validTo) : null,
  };
  return f.kind === 'flat'
    ? { ...common, import: numberOrRaw(f.import) }
    : {
        ...common,
        timeZone: HOME_TIME_ZONE,
        dayImport: numberOrRaw(f.dayImport),
        nightImport: numberOrRaw(f.nightImport),
        nightStart: f.nightStart,
        nightEnd: f.nightEnd,
      };
}

/** The form's check: blank dates named here, everything else the shared tariff schema's, at the field it names. */
export const tariffFormSchema = z
  .custom<TariffForm>((v) => typeof v === 'object' && v !== null)
  .superRefine((f, ctx) => {
    const dates: Record<string, string> = {};
    if (!f.validFrom) dates.validFrom = 'Must be given: the first day this tariff prices.';
    else if (f.validTo && f.validTo < f.validFrom) dates.validTo = 'Must be the first day or later.';
    for (const [field, message] of Object.entries(dates)) ctx.addIssue({ code: 'custom', path: [field], message });
    const checked = parseTariff(tariffOf(f));
    if (checked.ok) return;
    for (const e of checked.errors)
      if (!(e.field in dates)) ctx.addIssue({ code: 'custom', path: e.field.split('.'), message: e.message });
  });
