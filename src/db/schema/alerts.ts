import {
  bigserial,
  boolean,
  index,
  jsonb,
  pgEnum,
  pgTable,
  text,
  timestamp,
  uniqueIndex,
  uuid,
} from 'drizzle-orm/pg-core';
import { sql } from 'drizzle-orm';
import { users } from './auth';
import { companies } from './companies';
import { tanks } from './homes';
import { alertKinds, alertSeverities, alertStates, type AlertEvidence, type EngineState } from '../../lib/alerts/types';

/**
 * Alerts: the few things about a tank a person must act on, with their evidence and lifecycle
 * (open → acknowledged → resolved). The rules live in src/lib/alerts; these tables keep what they
 * decided, the per-company thresholds, each tank's incremental rule state, and every e-mail sent.
 */
export { alertKinds, alertSeverities, alertStates };
export const alertKindEnum = pgEnum('alert_kind', alertKinds);
export const alertSeverityEnum = pgEnum('alert_severity', alertSeverities);
export const alertStateEnum = pgEnum('alert_state', alertStates);

export const alerts = pgTable(
  'alerts',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    companyId: uuid('company_id')
      .notNull()
      .references(() => companies.id, { onDelete: 'cascade' }),
    tankId: uuid('tank_id')
      .notNull()
      .references(() => tanks.id, { onDelete: 'cascade' }),
    kind: alertKindEnum('kind').notNull(),
    severity: alertSeverityEnum('severity').notNull(),
    state: alertStateEnum('state').notNull().default('open'),
    /** What triggered it: a sentence, the figures, and the readings or events behind them. */
    evidence: jsonb('evidence').$type<AlertEvidence>().notNull(),
    /** When the condition was first met (telemetry time), not when the row was written. */
    openedAt: timestamp('opened_at', { withTimezone: true }).notNull(),
    acknowledgedAt: timestamp('acknowledged_at', { withTimezone: true }),
    acknowledgedBy: text('acknowledged_by').references(() => users.id, { onDelete: 'set null' }),
    resolvedAt: timestamp('resolved_at', { withTimezone: true }),
    /** Null with a resolvedAt: resolved automatically because the condition cleared. */
    resolvedBy: text('resolved_by').references(() => users.id, { onDelete: 'set null' }),
    note: text('note'),
    assigneeId: text('assignee_id').references(() => users.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    // One alert per tank and kind that is not yet resolved: the rules can never raise a duplicate.
    uniqueIndex('alerts_one_active_per_tank_kind').on(t.tankId, t.kind).where(sql`state <> 'resolved'`),
    index('alerts_company_state_idx').on(t.companyId, t.state, t.openedAt),
    // A company's unresolved alerts without reading its resolved history (the tank list's ranking and filters).
    index('alerts_open_by_company_idx').on(t.companyId, t.tankId, t.kind).where(sql`state <> 'resolved'`),
    index('alerts_tank_idx').on(t.tankId, t.openedAt),
  ],
);
export type AlertRow = typeof alerts.$inferSelect;

/** A company's own thresholds (only the values it changed; the rest are the defaults). */
export const alertThresholds = pgTable('alert_thresholds', {
  companyId: uuid('company_id')
    .primaryKey()
    .references(() => companies.id, { onDelete: 'cascade' }),
  settings: jsonb('settings').$type<Record<string, unknown>>().notNull().default({}),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  updatedBy: text('updated_by').references(() => users.id, { onDelete: 'set null' }),
});

/** Each tank's rule state, carried between batches so rules never rescan history. */
export const alertTankState = pgTable('alert_tank_state', {
  tankId: uuid('tank_id')
    .primaryKey()
    .references(() => tanks.id, { onDelete: 'cascade' }),
  /** Newest reading the rules have seen (telemetry time). */
  evaluatedTo: timestamp('evaluated_to', { withTimezone: true }),
  state: jsonb('state').$type<EngineState>(),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
});

export const notificationChannels = ['immediate', 'digest', 'householder'] as const;
export type NotificationChannel = (typeof notificationChannels)[number];

/** Every alert e-mail sent; the unique key makes each notice go out once. */
export const alertNotifications = pgTable(
  'alert_notifications',
  {
    id: bigserial('id', { mode: 'number' }).primaryKey(),
    companyId: uuid('company_id')
      .notNull()
      .references(() => companies.id, { onDelete: 'cascade' }),
    /** Null for a digest (it covers many). */
    alertId: uuid('alert_id').references(() => alerts.id, { onDelete: 'cascade' }),
    userId: text('user_id').references(() => users.id, { onDelete: 'set null' }),
    email: text('email').notNull(),
    channel: text('channel').$type<NotificationChannel>().notNull(),
    dedupeKey: text('dedupe_key').notNull(),
    subject: text('subject').notNull(),
    sentAt: timestamp('sent_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex('alert_notifications_dedupe_uq').on(t.dedupeKey),
    index('alert_notifications_alert_idx').on(t.alertId),
  ],
);
export type AlertNotification = typeof alertNotifications.$inferSelect;

/** A person's choice about alert e-mails (householders may opt out of their notices). */
export const notificationPreferences = pgTable('notification_preferences', {
  userId: text('user_id')
    .primaryKey()
    .references(() => users.id, { onDelete: 'cascade' }),
  householderNotices: boolean('householder_notices').notNull().default(true),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
});
