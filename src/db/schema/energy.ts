import { date, index, jsonb, pgEnum, pgTable, primaryKey, real, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { users } from './auth';
import { companies } from './companies';
import { homes, tanks } from './homes';
import type { Tariff } from '../../lib/energy';

export const tariffKinds = ['flat', 'day_night', 'half_hourly'] as const;
export type TariffKind = (typeof tariffKinds)[number];
export const tariffKindEnum = pgEnum('tariff_kind', tariffKinds);

/**
 * Electricity tariffs: a company's defaults (home_id null) and a home's own. A home with tariffs of
 * its own is priced only by them; a home without takes the company defaults. Within one list the
 * tariff in force with the latest start wins (the energy core's priceAt), so a new tariff
 * supersedes an open-ended older one from its start and nothing is ever overwritten.
 *
 * `prices` holds the energy core's normalised Tariff (prices in p/kWh, instants as epoch ms); the
 * validity columns repeat its bounds so that queries can pick tariffs by period.
 */
export const tariffs = pgTable(
  'tariffs',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    companyId: uuid('company_id')
      .notNull()
      .references(() => companies.id, { onDelete: 'cascade' }),
    homeId: uuid('home_id').references(() => homes.id, { onDelete: 'cascade' }),
    kind: tariffKindEnum('kind').notNull(),
    name: text('name'),
    validFrom: timestamp('valid_from', { withTimezone: true }).notNull(),
    /** Exclusive; null while open-ended. */
    validTo: timestamp('valid_to', { withTimezone: true }),
    prices: jsonb('prices').$type<Tariff>().notNull(),
    createdBy: text('created_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('tariffs_company_home_idx').on(t.companyId, t.homeId, t.validFrom)],
);
export type TariffRow = typeof tariffs.$inferSelect;
export type NewTariffRow = typeof tariffs.$inferInsert;

/**
 * Each tank's energy and cost for each local calendar day that has ended: the energy core's
 * accountDay, kept so that fleet figures (averages, outliers) read a row per tank-day instead of
 * the day's 1,440 readings. Written by the ingest worker's energy-day job
 * (src/lib/tank-energy/energy-days.server.ts) from the queue below; the company id is repeated so
 * that a company's days are one index range.
 */
export const energyDays = pgTable(
  'energy_days',
  {
    tankId: uuid('tank_id')
      .notNull()
      .references(() => tanks.id, { onDelete: 'cascade' }),
    /** Local calendar date at the home. */
    day: date('day', { mode: 'string' }).notNull(),
    companyId: uuid('company_id')
      .notNull()
      .references(() => companies.id, { onDelete: 'cascade' }),
    costPence: real('cost_pence').notNull(),
    heatPumpHeatKWh: real('heat_pump_heat_kwh').notNull(),
    heatPumpElectricityKWh: real('heat_pump_electricity_kwh').notNull(),
    immersionGridHeatKWh: real('immersion_grid_heat_kwh').notNull(),
    immersionSolarHeatKWh: real('immersion_solar_heat_kwh').notNull(),
    drawnLitres40: real('drawn_litres40').notNull(),
    standingLossKWh: real('standing_loss_kwh').notNull(),
    solarExportForgonePence: real('solar_export_forgone_pence').notNull(),
    /** Grid electricity used while no tariff was in force (left out of the cost), kWh. */
    unpricedKWh: real('unpriced_kwh').notNull(),
    coveredMinutes: real('covered_minutes').notNull(),
    computedAt: timestamp('computed_at', { withTimezone: true }).notNull().defaultNow(),
  },
  // drizzle/0010 adds the tank and the summed figures to the (company_id, day) index with INCLUDE, so that
  // the fleet figures are an index-only scan over the days asked for.
  (t) => [primaryKey({ columns: [t.tankId, t.day] }), index('energy_days_company_day_idx').on(t.companyId, t.day)],
);
export type EnergyDayRow = typeof energyDays.$inferSelect;

/**
 * Hours whose readings changed (their hourly rollup was written), so that the days they fall in are
 * accounted again once they have ended. Filled by triggers on rollups_1h (drizzle/0008), and for a
 * home's days when a tariff that prices them is added.
 */
export const energyDayDirty = pgTable(
  'energy_day_dirty',
  {
    tankId: uuid('tank_id').notNull(),
    hour: timestamp('hour', { withTimezone: true }).notNull(),
  },
  (t) => [primaryKey({ columns: [t.tankId, t.hour] }), index('energy_day_dirty_hour_idx').on(t.hour)],
);
