// Request shapes of the energy, tariff and planning endpoints (zod), shared by islands and endpoints.
import { z } from '@/lib/zod';
import type { DayEnergy, MonthEnergy, PlanStep } from '../energy';
import type { Fence, outlierRule } from './fleet-outliers';

/** The household clock every demo home keeps. */
export const HOME_TIME_ZONE = 'Europe/London';
/** Longest range one energy request may account, days (a product limit: about 90,000 readings). */
const MAX_ENERGY_DAYS = 62;

const date = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}$/, 'must be a date written YYYY-MM-DD')
  .refine((s) => !Number.isNaN(Date.parse(`${s}T00:00:00Z`)), 'is not a calendar date');

/** GET /api/tanks/{id}/energy?from&to: local calendar dates, inclusive; the last 7 days by default. */
export const energyQuery = z
  .object({ from: date.optional(), to: date.optional() })
  .strict()
  .transform((q, ctx) => {
    const today = new Date().toISOString().slice(0, 10);
    const to = q.to ?? today;
    const from = q.from ?? new Date(Date.parse(`${to}T00:00:00Z`) - 6 * 86_400_000).toISOString().slice(0, 10);
    const days = (Date.parse(`${to}T00:00:00Z`) - Date.parse(`${from}T00:00:00Z`)) / 86_400_000 + 1;
    if (days < 1) ctx.addIssue({ code: z.ZodIssueCode.custom, path: ['to'], message: 'to must be on or after from.' });
    if (days > MAX_ENERGY_DAYS)
      ctx.addIssue({
        code: z.ZodIssueCode.custom,
        path: ['to'],
        message: `The range is ${days} days; at most ${MAX_ENERGY_DAYS} fit in one request.`,
      });
    return { from, to };
  });
export type EnergyQuery = z.infer<typeof energyQuery>;

/**
 * POST /api/tanks/{id}/plan and …/plan/send. The default floor is the least V40 Commission
 * Regulation (EU) No 814/2013 asks of a water heater declared for load profile M: 65 L.
 */
export const planBody = z
  .object({
    comfortFloorL40: z
      .number({ message: 'comfortFloorL40 must be a number of litres at 40 °C.' })
      .min(0, 'comfortFloorL40 must be 0 L or more.')
      .max(1000, 'comfortFloorL40 must be at most 1000 L.')
      .default(65),
    hours: z
      .number()
      .int('hours must be a whole number.')
      .min(24, 'hours must be at least 24.')
      .max(48, 'hours must be at most 48.')
      .default(24),
  })
  .strict();
export type PlanBody = z.infer<typeof planBody>;

/** JSON input of POST /api/tariffs (flat and day/night; half-hourly prices come as CSV). */
export const tariffJsonBody = z
  .object({
    /** Required, so that a company default (null) is never set by leaving it out. */
    homeId: z
      .string({ message: 'homeId must be the id of a home, or null for a company default tariff.' })
      .uuid('homeId must be the id of a home.')
      .nullable(),
    tariff: z.unknown(),
  })
  .strict();

/** Query string of a CSV upload to POST /api/tariffs. */
export const tariffCsvQuery = z
  .object({
    homeId: z.string().uuid('homeId must be the id of a home.').optional(),
    unit: z.enum(['p/kWh', '£/kWh'], { message: 'unit must be p/kWh or £/kWh' }).optional(),
    name: z.string().trim().max(120).optional(),
    negativeImportAllowed: z.enum(['true', 'false']).optional(),
  })
  .strict();

/** What GET /api/tanks/{id}/energy answers. */
export interface EnergyResponse {
  from: string;
  to: string;
  timeZone: string;
  /** The tank's home (its tariff page is /homes/{homeId}/tariff), or null for a tank not yet in a home. */
  homeId: string | null;
  tariffSource: 'home' | 'company' | 'none';
  days: DayEnergy[];
  months: MonthEnergy[];
  totals: {
    costPence: number;
    electricityKWh: number;
    drawnLitres40: number;
    heatInKWh: number;
    dhwCop: number | null;
    days: number;
    /** Heat from the immersion on diverted solar surplus (free), kWh, and what that surplus would have earned exported, pence. */
    solarHeatKWh: number;
    solarExportForgonePence: number;
  };
}

/** What POST /api/tanks/{id}/plan answers. */
export interface PlanResponse {
  startMs: number;
  stepMin: number;
  comfortFloorL40: number;
  steps: PlanStep[];
  baselineV40: number[];
  schedule: { start: string; end: string; source: 'heat_pump' | 'immersion' }[];
  /** The daily windows a set_schedule command would carry, local HH:MM ([] = any time; null = the plan never heats). */
  windows: { from: string; to: string }[] | null;
  costPence: number;
  baselineCostPence: number;
  savingsPence: number;
  floorMet: boolean;
  tariffSource: 'home' | 'company';
}

/** Longest range the fleet figures compare, days (stored days are kept 400). */
const MAX_FLEET_ENERGY_DAYS = 366;

/**
 * GET /api/fleet/energy?from&to: local calendar dates, inclusive; by default the 30 days that ended
 * yesterday (today has not ended, so it has no stored figures yet).
 */
export const fleetEnergyQuery = z
  .object({ from: date.optional(), to: date.optional() })
  .strict()
  .transform((q, ctx) => {
    const yesterday = new Date(Date.now() - 86_400_000).toISOString().slice(0, 10);
    const to = q.to ?? yesterday;
    const from = q.from ?? new Date(Date.parse(`${to}T00:00:00Z`) - 29 * 86_400_000).toISOString().slice(0, 10);
    const days = (Date.parse(`${to}T00:00:00Z`) - Date.parse(`${from}T00:00:00Z`)) / 86_400_000 + 1;
    if (days < 1) ctx.addIssue({ code: z.ZodIssueCode.custom, path: ['to'], message: 'to must be on or after from.' });
    if (days > MAX_FLEET_ENERGY_DAYS)
      ctx.addIssue({
        code: z.ZodIssueCode.custom,
        path: ['to'],
        message: `The range is ${days} days; at most ${MAX_FLEET_ENERGY_DAYS} fit in one request.`,
      });
    return { from, to };
  });
export type FleetEnergyQuery = z.infer<typeof fleetEnergyQuery>;

/** One home that stands apart on one figure. */
export interface FleetOutlier {
  tankId: string;
  serial: string;
  homeReference: string | null;
  town: string | null;
  metric: 'cost_per_100l' | 'dhw_cop';
  /** Pence per 100 litres at 40 °C, or the DHW COP. */ value: number;
  side: 'high' | 'low';
  /** How far beyond its fence, in interquartile ranges (null when the IQR is 0). */ beyondIqr: number | null;
  days: number;
}

/** What GET /api/fleet/energy answers. */
export interface FleetEnergyResponse {
  from: string;
  to: string;
  timeZone: string;
  /** Homes (tanks) with stored days in the range, and those days. */ homes: number;
  homeDays: number;
  averages: {
    /** Fleet cost over fleet home-days, pence. */ costPencePerHomeDay: number | null;
    /** Fleet cost over fleet litres drawn, pence per 100 L at 40 °C. */ costPencePer100L: number | null;
    /** Fleet heat-pump heat over its electricity. */ dhwCop: number | null;
    /** Free heat from diverted solar surplus across the fleet, kWh. */ solarHeatKWh: number;
    /** Grid electricity no tariff priced (left out of the costs), kWh. */ unpricedKWh: number;
  };
  fences: { cost_per_100l: Fence | null; dhw_cop: Fence | null };
  outliers: FleetOutlier[];
  rule: typeof outlierRule;
}
