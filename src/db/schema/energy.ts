import { index, jsonb, pgEnum, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { users } from './auth';
import { companies } from './companies';
import { homes } from './homes';
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
    companyId: uuid('company_id').notNull().references(() => companies.id, { onDelete: 'cascade' }),
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
