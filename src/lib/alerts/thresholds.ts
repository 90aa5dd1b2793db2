// The thresholds every rule reads, with their defaults and where each default comes from. A
// company admin may change any of them (src/pages/admin/alert-settings.astro); what a company
// stores is only what it changed, merged over these defaults. Pure: no I/O.
import { z } from '@/lib/zod';
import { messages } from '@/lib/zod-messages';
import { alertKinds, alertSeverities, type AlertKind, type AlertSeverity } from './types';

const num = (label: string, unit: string, min: number, max: number) =>
  z
    .number(messages(`${label} is required.`, `${label} must be a number (${unit}).`))
    .min(min, `${label} must be at least ${min} ${unit}.`)
    .max(max, `${label} must be at most ${max} ${unit}.`);
const whole = (label: string, unit: string, min: number, max: number) =>
  num(label, unit, min, max).int(`${label} must be a whole number of ${unit}.`);

/** One entry per setting: the form, the endpoint and the rules all read this table. */
export const thresholdFields = {
  shortCycleMinGapMin: {
    group: 'short_cycling',
    label: 'Shortest gap between compressor starts',
    unit: 'min',
    source: 'common practice (at most one hot-water start an hour)',
    schema: whole('Shortest gap between compressor starts', 'minutes', 5, 240),
    default: 60,
  },
  shortCycleMinRunMin: {
    group: 'short_cycling',
    label: 'Shortest compressor run',
    unit: 'min',
    source: 'common practice',
    schema: whole('Shortest compressor run', 'minutes', 1, 120),
    default: 10,
  },
  shortCycleViolations: {
    group: 'short_cycling',
    label: 'Short cycles that raise the alert',
    unit: 'cycles',
    source: 'common practice (one cut-short run now and then is normal)',
    schema: whole('Short cycles that raise the alert', 'cycles', 1, 50),
    default: 3,
  },
  shortCycleWindowH: {
    group: 'short_cycling',
    label: '…within',
    unit: 'h',
    source: 'common practice',
    schema: whole('Short-cycle window', 'hours', 1, 72),
    default: 6,
  },
  offlineAfterMin: {
    group: 'offline',
    label: 'No reading for',
    unit: 'min',
    source: 'common practice (tanks report every minute)',
    schema: whole('Offline after', 'minutes', 5, 1440),
    default: 20,
  },
  sensorMinC: {
    group: 'sensor_fault',
    label: 'Lowest plausible water temperature',
    unit: '°C',
    source: 'common practice (a cylinder stands in a frost-free space)',
    schema: num('Lowest plausible water temperature', '°C', -10, 30),
    default: 1,
  },
  sensorMaxC: {
    group: 'sensor_fault',
    label: 'Highest plausible water temperature',
    unit: '°C',
    source: 'from memory (the temperature relief valve of an unvented cylinder opens at about 90–95 °C)',
    schema: num('Highest plausible water temperature', '°C', 60, 105),
    default: 99,
  },
  sensorRangeMin: {
    group: 'sensor_fault',
    label: 'Out of range or missing for at least',
    unit: 'min',
    source: 'common practice',
    schema: whole('Out-of-range persistence', 'minutes', 1, 720),
    default: 5,
  },
  sensorStuckWindowMin: {
    group: 'sensor_fault',
    label: 'Stuck: no change over',
    unit: 'min',
    source: 'common practice',
    schema: whole('Stuck window', 'minutes', 30, 1440),
    default: 120,
  },
  sensorStuckToleranceK: {
    group: 'sensor_fault',
    label: 'Stuck: change smaller than',
    unit: 'K',
    source: 'common practice (a working NTC reading jitters by a few hundredths of a kelvin)',
    schema: num('Stuck tolerance', 'K', 0, 1),
    default: 0.05,
  },
  sensorNeighbourMoveK: {
    group: 'sensor_fault',
    label: 'Stuck: while a neighbour moves by',
    unit: 'K',
    source: 'common practice',
    schema: num('Neighbour movement', 'K', 0.5, 20),
    default: 2,
  },
  sensorInversionK: {
    group: 'sensor_fault',
    label: 'Inversion: lower sensor warmer than the one above by',
    unit: 'K',
    source:
      'common practice (buoyancy mixes any real inversion within minutes; two sensors of ±0.5 K tolerance allow about 1 K)',
    schema: num('Largest inversion', 'K', 0.5, 20),
    default: 3,
  },
  sensorInversionMin: {
    group: 'sensor_fault',
    label: 'Inversion: for at least',
    unit: 'min',
    source: 'common practice',
    schema: whole('Inversion persistence', 'minutes', 1, 720),
    default: 30,
  },
  legionellaC: {
    group: 'legionella_risk',
    label: 'Stored water temperature',
    unit: '°C',
    source: 'HSE HSG274 Part 2 (2014): store hot water at 60 °C or above',
    schema: num('Legionella temperature', '°C', 50, 80),
    default: 60,
  },
  legionellaHoldMin: {
    group: 'legionella_risk',
    label: 'Held for at least',
    unit: 'min',
    source: 'common practice (a weekly hour at 60 °C)',
    schema: whole('Legionella hold', 'minutes', 1, 1440),
    default: 60,
  },
  legionellaShare: {
    group: 'legionella_risk',
    label: 'Across this share of the volume',
    unit: '%',
    source: 'common practice',
    schema: num('Legionella share of volume', '%', 10, 100),
    default: 50,
  },
  legionellaWindowDays: {
    group: 'legionella_risk',
    label: 'At least once every',
    unit: 'days',
    source: 'common practice (weekly)',
    schema: whole('Legionella window', 'days', 1, 14),
    default: 7,
  },
  lowHotWaterLookaheadH: {
    group: 'low_hot_water',
    label: 'Look ahead at usual demand for',
    unit: 'h',
    source: 'common practice (a heat pump needs about that long to reheat a cylinder)',
    schema: whole('Look-ahead', 'hours', 1, 12),
    default: 2,
  },
  lowHotWaterMinDemandL: {
    group: 'low_hot_water',
    label: 'Only when usual demand is at least',
    unit: 'L at 40 °C',
    source: 'common practice (about one shower)',
    schema: num('Smallest demand', 'litres', 1, 500),
    default: 30,
  },
  lowHotWaterMin: {
    group: 'low_hot_water',
    label: 'Short for at least',
    unit: 'min',
    source: 'common practice',
    schema: whole('Low hot water persistence', 'minutes', 1, 720),
    default: 120,
  },
  immersionMaxShare: {
    group: 'immersion_heavy',
    label: 'Immersion share of the heat above',
    unit: '%',
    source:
      'common practice (with a heat pump fitted the element should only top up for a weekly hour at 60 °C, a few per cent of the heat)',
    schema: num('Immersion share', '%', 1, 100),
    default: 20,
  },
  immersionWindowDays: {
    group: 'immersion_heavy',
    label: 'Over the last',
    unit: 'days',
    source: 'common practice (a week)',
    schema: whole('Immersion window', 'days', 1, 14),
    default: 7,
  },
  heatLossMarginPct: {
    group: 'heat_loss',
    label: 'Measured loss above declared by',
    unit: '%',
    source: 'common practice',
    schema: num('Heat-loss margin', '%', 5, 500),
    default: 50,
  },
  heatLossAmbientC: {
    group: 'heat_loss',
    label: 'Air around the cylinder',
    unit: '°C',
    source: 'from memory (EN 12897 measures standing loss in a room at about 20 °C)',
    schema: num('Ambient temperature', '°C', 0, 35),
    default: 20,
  },
} as const;

export type ThresholdKey = keyof typeof thresholdFields;
export type Thresholds = { [K in ThresholdKey]: number } & { severity: Record<AlertKind, AlertSeverity> };

/** Default severity of each kind: health first, then what damages plant or costs money. */
const defaultSeverity: Record<AlertKind, AlertSeverity> = {
  legionella_risk: 'critical',
  offline: 'warning',
  sensor_fault: 'warning',
  short_cycling: 'warning',
  low_hot_water: 'warning',
  immersion_heavy: 'warning',
  heat_loss: 'info',
};

export const defaultThresholds: Thresholds = {
  ...(Object.fromEntries(Object.entries(thresholdFields).map(([k, f]) => [k, f.default])) as {
    [K in ThresholdKey]: number;
  }),
  severity: { ...defaultSeverity },
};

const severityField = z.enum(alertSeverities, { error: 'must be critical, warning or info.' });

/** What a company may store: any subset of the settings and of the severities. */
export const thresholdOverridesSchema = z
  .object({
    ...(Object.fromEntries(Object.entries(thresholdFields).map(([k, f]) => [k, f.schema.optional()])) as {
      [K in ThresholdKey]: z.ZodOptional<z.ZodNumber>;
    }),
    severity: z
      .object(
        Object.fromEntries(alertKinds.map((k) => [k, severityField.optional()])) as Record<
          AlertKind,
          z.ZodOptional<typeof severityField>
        >,
      )
      .partial()
      .optional(),
  })
  .strict()
  .superRefine((v, ctx) => {
    const min = v.sensorMinC ?? defaultThresholds.sensorMinC;
    const max = v.sensorMaxC ?? defaultThresholds.sensorMaxC;
    if (min >= max)
      ctx.addIssue({
        code: 'custom',
        path: ['sensorMaxC'],
        message: 'The highest plausible temperature must be above the lowest.',
      });
  });
export type ThresholdOverrides = z.infer<typeof thresholdOverridesSchema>;

/** The defaults with a company's changes on top; stored values that no longer validate are ignored. */
export function resolveThresholds(stored: unknown): Thresholds {
  const parsed = thresholdOverridesSchema.safeParse(stored ?? {});
  if (!parsed.success) return { ...defaultThresholds, severity: { ...defaultSeverity } };
  const { severity, ...rest } = parsed.data;
  const out: Thresholds = { ...defaultThresholds, severity: { ...defaultSeverity } };
  for (const [k, v] of Object.entries(rest)) if (typeof v === 'number') (out as Record<string, unknown>)[k] = v;
  for (const k of alertKinds) if (severity?.[k]) out.severity[k] = severity[k]!;
  return out;
}

/**
 * What the thresholds form sends: the settings that differ from their defaults or were stored
 * before (so a value put back to its default is stored as such), numbers as typed; text that is
 * not a number is sent as it is, for the schema to name the field.
 */
export function thresholdChanges(
  typed: { [K in ThresholdKey]?: string | number } & { severity?: Partial<Record<AlertKind, AlertSeverity>> },
  stored: Record<string, unknown>,
): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const k of Object.keys(thresholdFields) as ThresholdKey[]) {
    const raw = String(typed[k] ?? '').trim();
    const value = raw !== '' && Number.isFinite(Number(raw)) ? Number(raw) : raw;
    if (value !== thresholdFields[k].default || k in stored) out[k] = value;
  }
  if (typed.severity) out.severity = typed.severity;
  return out;
}
