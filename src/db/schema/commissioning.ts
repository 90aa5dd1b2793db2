import {
  boolean,
  index,
  integer,
  jsonb,
  pgEnum,
  pgTable,
  real,
  text,
  timestamp,
  uniqueIndex,
  uuid,
} from 'drizzle-orm/pg-core';
import { users } from './auth';
import { companies } from './companies';
import { homes, tanks } from './homes';

/**
 * Commissioning, handover and service records. A commissioning starts as a draft the engineer
 * saves step by step; sign-off locks it (later changes are amendments, with who and when) and
 * produces the householder's PDF. Service visits follow for the life of the tank.
 */

/** Heat-pump models the company fits, with the NTC curve of their hot-water sensor input (kept by admins). */
export const heatPumpModels = pgTable(
  'heat_pump_models',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    companyId: uuid('company_id')
      .notNull()
      .references(() => companies.id, { onDelete: 'cascade' }),
    name: text('name').notNull(),
    outputW: integer('output_w').notNull(),
    /** The sensor input's NTC: resistance at 25 °C (Ω) and Beta constant (K). */
    ntcR25Ohm: real('ntc_r25_ohm').notNull(),
    ntcBetaK: real('ntc_beta_k').notNull(),
    createdBy: text('created_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('heat_pump_models_company_name_uq').on(t.companyId, t.name)],
);
export type HeatPumpModel = typeof heatPumpModels.$inferSelect;

export const commissioningStatuses = ['draft', 'signed'] as const;
export type CommissioningStatus = (typeof commissioningStatuses)[number];
export const commissioningStatusEnum = pgEnum('commissioning_status', commissioningStatuses);

/** One install's commissioning: a draft (data by wizard step), then a locked, signed record. */
export const commissionings = pgTable(
  'commissionings',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    companyId: uuid('company_id')
      .notNull()
      .references(() => companies.id, { onDelete: 'cascade' }),
    engineerUserId: text('engineer_user_id').references(() => users.id, { onDelete: 'set null' }),
    status: commissioningStatusEnum('status').notNull().default('draft'),
    /** The step the engineer last saved (the wizard resumes there). */
    step: text('step').notNull().default('home'),
    /** The draft's answers, by step (src/lib/commissioning/steps.ts validates each). */
    data: jsonb('data').$type<Record<string, unknown>>().notNull().default({}),
    /** Created when the cylinder is registered for its connection check. */
    homeId: uuid('home_id').references(() => homes.id, { onDelete: 'set null' }),
    tankId: uuid('tank_id').references(() => tanks.id, { onDelete: 'set null' }),
    /** The signed record as it was signed (never changed afterwards; amendments sit beside it). */
    record: jsonb('record').$type<Record<string, unknown>>(),
    signedAt: timestamp('signed_at', { withTimezone: true }),
    signedBy: text('signed_by').references(() => users.id, { onDelete: 'set null' }),
    pdfKey: text('pdf_key'),
    /** When the householder's invitation and PDF went out (null: sign-off must finish the handover). */
    handoverSentAt: timestamp('handover_sent_at', { withTimezone: true }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index('commissionings_company_idx').on(t.companyId, t.updatedAt),
    uniqueIndex('commissionings_tank_uq').on(t.tankId),
  ],
);
export type Commissioning = typeof commissionings.$inferSelect;

/** A change to a signed record: what, from what to what, why, who and when. */
export const commissioningAmendments = pgTable(
  'commissioning_amendments',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    commissioningId: uuid('commissioning_id')
      .notNull()
      .references(() => commissionings.id, { onDelete: 'cascade' }),
    companyId: uuid('company_id')
      .notNull()
      .references(() => companies.id, { onDelete: 'cascade' }),
    field: text('field').notNull(),
    oldValue: jsonb('old_value'),
    newValue: jsonb('new_value'),
    reason: text('reason').notNull(),
    userId: text('user_id').references(() => users.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('commissioning_amendments_record_idx').on(t.commissioningId, t.createdAt)],
);
export type CommissioningAmendment = typeof commissioningAmendments.$inferSelect;

import { visitKinds, type VisitKind } from '../../lib/commissioning/visit-kinds';
export { visitKinds, type VisitKind };
export const visitKindEnum = pgEnum('service_visit_kind', visitKinds);

export interface VisitPart {
  name: string;
  quantity: number;
}
export interface VisitReadings {
  topC?: number;
  bottomC?: number;
  inletPressureBar?: number;
  vesselPrechargeBar?: number;
  reliefValveTested?: boolean;
  dischargeChecked?: boolean;
  /** The tank's latest telemetry when the visit was recorded, bottom to top. */
  telemetryLayersC?: (number | null)[];
  telemetryAt?: string;
}

/** An annual inspection, fault call or repair at one tank. */
export const serviceVisits = pgTable(
  'service_visits',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    companyId: uuid('company_id')
      .notNull()
      .references(() => companies.id, { onDelete: 'cascade' }),
    tankId: uuid('tank_id')
      .notNull()
      .references(() => tanks.id, { onDelete: 'cascade' }),
    kind: visitKindEnum('kind').notNull(),
    visitedAt: timestamp('visited_at', { withTimezone: true }).notNull(),
    engineerUserId: text('engineer_user_id').references(() => users.id, { onDelete: 'set null' }),
    findings: text('findings').notNull(),
    parts: jsonb('parts').$type<VisitPart[]>().notNull().default([]),
    readings: jsonb('readings').$type<VisitReadings>().notNull().default({}),
    /** Ids of the alerts this visit resolved. */
    resolvedAlerts: text('resolved_alerts').array().notNull().default([]),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index('service_visits_tank_idx').on(t.tankId, t.visitedAt),
    index('service_visits_company_idx').on(t.companyId, t.visitedAt),
  ],
);
export type ServiceVisit = typeof serviceVisits.$inferSelect;

export const uploadKinds = ['photo', 'document'] as const;
export type UploadKind = (typeof uploadKinds)[number];

/** A photo or document kept in object storage, attached to a commissioning, a tank or a visit. */
export const uploads = pgTable(
  'uploads',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    companyId: uuid('company_id')
      .notNull()
      .references(() => companies.id, { onDelete: 'cascade' }),
    commissioningId: uuid('commissioning_id').references(() => commissionings.id, { onDelete: 'cascade' }),
    tankId: uuid('tank_id').references(() => tanks.id, { onDelete: 'cascade' }),
    visitId: uuid('visit_id').references(() => serviceVisits.id, { onDelete: 'set null' }),
    kind: text('kind').$type<UploadKind>().notNull(),
    filename: text('filename').notNull(),
    contentType: text('content_type').notNull(),
    bytes: integer('bytes').notNull(),
    width: integer('width'),
    height: integer('height'),
    /** Whether the image was made smaller than it was sent. */
    downscaled: boolean('downscaled').notNull().default(false),
    storageKey: text('storage_key').notNull().unique(),
    uploadedBy: text('uploaded_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index('uploads_commissioning_idx').on(t.commissioningId),
    index('uploads_tank_idx').on(t.tankId),
    index('uploads_visit_idx').on(t.visitId),
  ],
);
export type Upload = typeof uploads.$inferSelect;
