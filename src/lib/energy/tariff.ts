// Electricity tariffs (import and export prices) and the price in force at an instant.
// Inside the energy core every price is in pence per kWh (p/kWh) and money in pence; tariffs
// entered in pounds per kWh (£/kWh) are converted once, at the edge, by the schemas below.
import { z } from '@/lib/zod';
import { messages } from '@/lib/zod-messages';
import { EnergyInputError } from './errors.js';
import { isTimeZone, localMinuteOfDay } from './local-time.js';
import { HALF_HOUR_MS, PENCE_PER_POUND } from './units.js';

/** Units a price may be entered in; stored prices are always p/kWh. */
export const priceUnits = ['p/kWh', '£/kWh'] as const;
/** A unit a price may be entered in. */
export type PriceUnit = (typeof priceUnits)[number];

/**
 * Highest plausible import or export price, p/kWh: anything above is taken for a unit mistake
 * (pence entered as pounds) and refused. A product limit (common practice), not a market rule.
 */
const MAX_PRICE_PENCE = 500;
/** Lowest import price accepted where a tariff allows negative prices, p/kWh (product limit, common practice). */
const MIN_NEGATIVE_PRICE_PENCE = -100;

/** Multiplier from `unit` to p/kWh. */
export function pencePerUnit(unit: PriceUnit): number {
  return unit === '£/kWh' ? PENCE_PER_POUND : 1;
}

/** Why a price is unusable, or null: `pence` in p/kWh after conversion. */
export function priceProblem(pence: number, kind: 'import' | 'export', negativeAllowed: boolean): string | null {
  if (!Number.isFinite(pence)) return 'is not a number';
  const floor = kind === 'import' && negativeAllowed ? MIN_NEGATIVE_PRICE_PENCE : 0;
  if (pence < floor) {
    return floor === 0
      ? `is negative (${round(pence)} p/kWh); this tariff does not allow negative ${kind} prices`
      : `is ${round(pence)} p/kWh, below the lowest accepted ${floor} p/kWh`;
  }
  if (pence > MAX_PRICE_PENCE) {
    return `is ${round(pence)} p/kWh, above the highest plausible ${MAX_PRICE_PENCE} p/kWh: check the unit (pence or pounds per kWh)`;
  }
  return null;
}

function round(x: number): number {
  return Math.round(x * 1000) / 1000;
}

const instant = z
  .string(
    messages(
      'must be given: an ISO 8601 date and time with a zone, e.g. 2025-01-01T00:00:00Z',
      'must be an ISO 8601 date and time with a zone, e.g. 2025-01-01T00:00:00Z',
    ),
  )
  .datetime({ offset: true, message: 'must be an ISO 8601 date and time with a zone, e.g. 2025-01-01T00:00:00Z' })
  .transform((s) => Date.parse(s));

/** A price as entered, in the tariff's unit; its range is checked after conversion (checkPrice). */
const price = (what: string) =>
  z.number(
    messages(
      `must be given: the ${what} price in the chosen unit`,
      `must be a number: the ${what} price in the chosen unit`,
    ),
  );

const clockTime = z
  .string(messages('must be given as a 24-hour clock time HH:MM'))
  .regex(/^([01]\d|2[0-3]):[0-5]\d$/, 'must be a 24-hour clock time HH:MM')
  .transform((s) => Number(s.slice(0, 2)) * 60 + Number(s.slice(3, 5)));

const common = {
  /** Shown to people; optional. */ name: z.string().trim().max(120).optional(),
  unit: z.enum(priceUnits, { message: 'must be p/kWh or £/kWh' }),
  validFrom: instant,
  validTo: instant.nullable().default(null),
};

function checkPrice(
  ctx: z.RefinementCtx,
  path: (string | number)[],
  pence: number,
  kind: 'import' | 'export',
  neg = false,
): void {
  const problem = priceProblem(pence, kind, neg);
  if (problem) ctx.addIssue({ code: z.ZodIssueCode.custom, path, message: `${path.join('.')} ${problem}.` });
}

function checkValidity(ctx: z.RefinementCtx, from: number, to: number | null): void {
  if (to !== null && to <= from) {
    ctx.addIssue({ code: z.ZodIssueCode.custom, path: ['validTo'], message: 'validTo must be after validFrom.' });
  }
}

/** One price for every hour. */
export interface FlatTariff {
  kind: 'flat';
  name?: string;
  /** Start of validity, epoch ms (inclusive). */ validFromMs: number;
  /** End of validity, epoch ms (exclusive); null while open-ended. */ validToMs: number | null;
  /** Import price, p/kWh. */ importPence: number;
  /** Export price, p/kWh. */ exportPence: number;
}

/** A cheaper night window on the local clock, the day price at other times. */
export interface DayNightTariff {
  kind: 'day_night';
  name?: string;
  /** IANA zone of the clock the window follows, e.g. Europe/London. */ timeZone: string;
  /** Night window start, local minutes after midnight. */ nightStartMin: number;
  /** Night window end (exclusive), local minutes after midnight; before the start when the window spans midnight. */ nightEndMin: number;
  /** Import price outside the night window, p/kWh. */ dayImportPence: number;
  /** Import price inside the night window, p/kWh. */ nightImportPence: number;
  /** Export price, p/kWh. */ exportPence: number;
  /** Start of validity, epoch ms (inclusive). */ validFromMs: number;
  /** End of validity, epoch ms (exclusive); null while open-ended. */ validToMs: number | null;
}

/** A price for every half-hour slot, contiguous from validFromMs to validToMs. */
export interface HalfHourlyTariff {
  kind: 'half_hourly';
  name?: string;
  /** Start of the first slot, epoch ms, on a half-hour boundary of UTC. */ validFromMs: number;
  /** End of the last slot, epoch ms (exclusive). */ validToMs: number;
  /** Import price of slot i (starting validFromMs + i·30 min), p/kWh. */ importPence: number[];
  /** Export price of slot i, p/kWh. */ exportPence: number[];
}

/** Any tariff, prices in p/kWh. */
export type Tariff = FlatTariff | DayNightTariff | HalfHourlyTariff;

/** Prices in force at one instant, p/kWh. */
export interface Price {
  importPence: number;
  exportPence: number;
}

/** Form or API input of a flat tariff: prices in `unit`, instants as ISO 8601 strings. */
const flatTariffInput = z
  .object({ kind: z.literal('flat'), ...common, import: price('import'), export: price('export').default(0) })
  .strict()
  .superRefine((t, ctx) => {
    const k = pencePerUnit(t.unit);
    checkPrice(ctx, ['import'], t.import * k, 'import');
    checkPrice(ctx, ['export'], t.export * k, 'export');
    checkValidity(ctx, t.validFrom, t.validTo);
  })
  .transform(
    (t): FlatTariff => ({
      kind: 'flat',
      ...(t.name ? { name: t.name } : {}),
      validFromMs: t.validFrom,
      validToMs: t.validTo,
      importPence: t.import * pencePerUnit(t.unit),
      exportPence: t.export * pencePerUnit(t.unit),
    }),
  );

/** Form or API input of a day/night tariff: night window as local HH:MM times in `timeZone`. */
const dayNightTariffInput = z
  .object({
    kind: z.literal('day_night'),
    ...common,
    timeZone: z
      .string()
      .max(64, 'must be an IANA time-zone name such as Europe/London')
      .default('Europe/London')
      .refine(isTimeZone, 'must be an IANA time-zone name such as Europe/London'),
    nightStart: clockTime,
    nightEnd: clockTime,
    dayImport: price('day import'),
    nightImport: price('night import'),
    export: price('export').default(0),
  })
  .strict()
  .superRefine((t, ctx) => {
    const k = pencePerUnit(t.unit);
    checkPrice(ctx, ['dayImport'], t.dayImport * k, 'import');
    checkPrice(ctx, ['nightImport'], t.nightImport * k, 'import');
    checkPrice(ctx, ['export'], t.export * k, 'export');
    if (t.nightStart === t.nightEnd) {
      ctx.addIssue({
        code: z.ZodIssueCode.custom,
        path: ['nightEnd'],
        message: 'nightEnd must differ from nightStart.',
      });
    }
    checkValidity(ctx, t.validFrom, t.validTo);
  })
  .transform((t): DayNightTariff => {
    const k = pencePerUnit(t.unit);
    return {
      kind: 'day_night',
      ...(t.name ? { name: t.name } : {}),
      timeZone: t.timeZone,
      nightStartMin: t.nightStart,
      nightEndMin: t.nightEnd,
      dayImportPence: t.dayImport * k,
      nightImportPence: t.nightImport * k,
      exportPence: t.export * k,
      validFromMs: t.validFrom,
      validToMs: t.validTo,
    };
  });

/** A refusal naming the field (dotted path) and why. */
export interface FieldError {
  field: string;
  message: string;
}

/** Validate and normalise a flat or day/night tariff entered in a form or sent to the API. */
export function parseTariff(
  input: unknown,
): { ok: true; tariff: FlatTariff | DayNightTariff } | { ok: false; errors: FieldError[] } {
  const kind = (input as { kind?: unknown } | null)?.kind;
  const schema = kind === 'flat' ? flatTariffInput : kind === 'day_night' ? dayNightTariffInput : null;
  if (!schema)
    return {
      ok: false,
      errors: [{ field: 'kind', message: 'kind must be flat or day_night (half-hourly prices are uploaded as CSV).' }],
    };
  const r = schema.safeParse(input);
  if (r.success) return { ok: true, tariff: r.data };
  return {
    ok: false,
    errors: r.error.issues.map((i) => {
      const field = i.path.join('.') || 'tariff';
      return { field, message: i.message.startsWith(field) ? i.message : `${field} ${i.message}` };
    }),
  };
}

function inForce(t: Tariff, ms: number): boolean {
  return ms >= t.validFromMs && (t.validToMs === null || ms < t.validToMs);
}

function priceOf(t: Tariff, ms: number): Price {
  switch (t.kind) {
    case 'flat':
      return { importPence: t.importPence, exportPence: t.exportPence };
    case 'day_night': {
      const m = localMinuteOfDay(ms, t.timeZone);
      const s = t.nightStartMin;
      const e = t.nightEndMin;
      const night = s < e ? m >= s && m < e : m >= s || m < e;
      return { importPence: night ? t.nightImportPence : t.dayImportPence, exportPence: t.exportPence };
    }
    case 'half_hourly': {
      const i = Math.floor((ms - t.validFromMs) / HALF_HOUR_MS);
      return { importPence: t.importPence[i]!, exportPence: t.exportPence[i]! };
    }
  }
}

/**
 * Lists of tariffs by precedence: at each instant the first list with a tariff in force prices it.
 * A home's own tariffs come first and the company defaults after, so a home's tariff overrides the
 * default for its validity period only, and the default prices the home before and after it.
 */
export interface TariffLayers {
  layers: readonly (readonly Tariff[])[];
}

/** What prices energy: one tariff, a list (latest start in force wins), or lists by precedence. */
export type Tariffs = Tariff | readonly Tariff[] | TariffLayers;

const isLayers = (t: Tariffs): t is TariffLayers => !Array.isArray(t) && 'layers' in (t as object);

/**
 * Import and export prices (p/kWh) in force at `epochMs`, or null when no tariff is in force then.
 * Within one list (a home's history, or a company's defaults) the tariff in force with the latest
 * `validFromMs` wins: a new tariff supersedes an open-ended older one from its start. Layers are
 * tried in order ({@link TariffLayers}).
 */
export function priceAt(tariff: Tariffs, epochMs: number): Price | null {
  if (!Number.isFinite(epochMs))
    throw new EnergyInputError('epochMs', `epochMs is ${String(epochMs)}: it must be epoch milliseconds.`);
  const lists = isLayers(tariff)
    ? tariff.layers
    : [Array.isArray(tariff) ? (tariff as readonly Tariff[]) : [tariff as Tariff]];
  for (const list of lists) {
    let best: Tariff | null = null;
    for (const t of list) if (inForce(t, epochMs) && (best === null || t.validFromMs > best.validFromMs)) best = t;
    if (best !== null) return priceOf(best, epochMs);
  }
  return null;
}

/**
 * Import prices (p/kWh) of `steps` consecutive steps of `stepMin` minutes from `startMs`, each taken
 * at its step's start: the price series the charge planner takes. Throws EnergyInputError naming the
 * first step no tariff covers.
 */
export function importPriceSeries(tariff: Tariffs, startMs: number, steps: number, stepMin = 30): number[] {
  const out = new Array<number>(steps);
  for (let i = 0; i < steps; i++) {
    const ms = startMs + i * stepMin * 60_000;
    const p = priceAt(tariff, ms);
    if (!p)
      throw new EnergyInputError(
        `prices[${i}]`,
        `No tariff is in force at ${new Date(ms).toISOString()} (step ${i}): add or extend a tariff before planning.`,
      );
    out[i] = p.importPence;
  }
  return out;
}
