import {
  boolean,
  index,
  integer,
  pgEnum,
  pgTable,
  primaryKey,
  real,
  smallint,
  text,
  timestamp,
  uniqueIndex,
  uuid,
} from 'drizzle-orm/pg-core';
import { sql } from 'drizzle-orm';
import { users } from './auth';
import { companies } from './companies';
import { heatSourceKinds, type HeatSource } from '../../lib/heat-sources';

/** A household served by a company. */
export const homes = pgTable(
  'homes',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    companyId: uuid('company_id')
      .notNull()
      .references(() => companies.id, { onDelete: 'cascade' }),
    reference: text('reference').notNull(),
    addressLine: text('address_line').notNull(),
    town: text('town').notNull(),
    postcode: text('postcode').notNull(),
    occupants: smallint('occupants').notNull().default(2),
    hasSolar: boolean('has_solar').notNull().default(false),
    /** Cold mains at this home, °C, where the company has measured it; null: EN 16147's 10 °C (src/lib/thermal/figures.ts). */
    coldInletC: real('cold_inlet_c'),
    contactName: text('contact_name'),
    contactEmail: text('contact_email'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    /**
     * What the tank list's free text searches, lower-cased once on write so a search is a plain
     * LIKE (much cheaper than ILIKE per row); fields apart by a unit separator (chr 31), so a match never
     * spans two of them. Trigram-indexed (pg_trgm).
     */
    searchText: text('search_text').generatedAlwaysAs(
      sql`lower("reference" || chr(31) || "address_line" || chr(31) || "postcode" || chr(31) || "town" || chr(31) || coalesce("contact_name", ''))`,
    ),
  },
  (t) => [
    uniqueIndex('homes_company_reference_uq').on(t.companyId, t.reference),
    index('homes_company_town_idx').on(t.companyId, t.town),
    index('homes_search_trgm_idx').using('gin', t.searchText.op('gin_trgm_ops')),
  ],
);
export type Home = typeof homes.$inferSelect;

/** Which householder accounts may see which homes. */
export const homeMembers = pgTable(
  'home_members',
  {
    homeId: uuid('home_id')
      .notNull()
      .references(() => homes.id, { onDelete: 'cascade' }),
    userId: text('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.homeId, t.userId] }), index('home_members_user_idx').on(t.userId)],
);

// The kinds and what each can do: src/lib/heat-sources.ts.
export const heatSources = heatSourceKinds;
export type { HeatSource };
export const heatSourceEnum = pgEnum('heat_source', heatSourceKinds);

/** An installed cylinder: its specification and how it is controlled. */
export const tanks = pgTable(
  'tanks',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    companyId: uuid('company_id')
      .notNull()
      .references(() => companies.id, { onDelete: 'cascade' }),
    homeId: uuid('home_id').references(() => homes.id, { onDelete: 'set null' }),
    serial: text('serial').notNull().unique(),
    model: text('model').notNull(),
    volumeL: integer('volume_l').notNull(),
    heightM: real('height_m').notNull(),
    sensorCount: smallint('sensor_count').notNull(),
    /** Height of each sensor above the tank bottom, bottom to top; null means evenly spaced. */
    sensorHeightsM: real('sensor_heights_m').array(),
    heatSource: heatSourceEnum('heat_source').notNull(),
    hpOutputW: integer('hp_output_w').notNull().default(0),
    immersionW: integer('immersion_w').notNull().default(3000),
    declaredLossW: real('declared_loss_w'),
    targetC: real('target_c').notNull().default(55),
    hysteresisK: real('hysteresis_k').notNull().default(5),
    /** SHA-256 of the device token (see src/lib/telemetry/device-token.ts); the token itself is shown once and never stored. */
    deviceTokenHash: text('device_token_hash'),
    deviceTokenIssuedAt: timestamp('device_token_issued_at', { withTimezone: true }),
    commissionedAt: timestamp('commissioned_at', { withTimezone: true }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    /** Serial and model for the tank list's free text, as `homes.search_text`. */
    searchText: text('search_text').generatedAlwaysAs(sql`lower("serial" || chr(31) || "model")`),
  },
  (t) => [
    // The tank list pages a company's tanks in serial order (and ties every other sort on serial).
    index('tanks_company_serial_idx').on(t.companyId, t.serial),
    index('tanks_home_idx').on(t.homeId),
    index('tanks_search_trgm_idx').using('gin', t.searchText.op('gin_trgm_ops')),
  ],
);
export type Tank = typeof tanks.$inferSelect;
export type NewTank = typeof tanks.$inferInsert;
