import { index, pgEnum, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { users } from './auth';
import { companies, roleEnum } from './companies';
import { homes } from './homes';

/**
 * An invitation by e-mail: staff (by an admin) or a householder for one home (by staff at
 * handover). Only the SHA-256 of the link's token is stored; the link works once, until it expires.
 */
export const invitations = pgTable(
  'invitations',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    companyId: uuid('company_id')
      .notNull()
      .references(() => companies.id, { onDelete: 'cascade' }),
    email: text('email').notNull(),
    name: text('name'),
    role: roleEnum('role').notNull(),
    /** Householder invitations: the home they will see. */
    homeId: uuid('home_id').references(() => homes.id, { onDelete: 'cascade' }),
    tokenHash: text('token_hash').notNull().unique(),
    invitedBy: text('invited_by').references(() => users.id, { onDelete: 'set null' }),
    expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
    acceptedAt: timestamp('accepted_at', { withTimezone: true }),
    acceptedBy: text('accepted_by').references(() => users.id, { onDelete: 'set null' }),
    revokedAt: timestamp('revoked_at', { withTimezone: true }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('invitations_company_idx').on(t.companyId, t.createdAt), index('invitations_home_idx').on(t.homeId)],
);
export type Invitation = typeof invitations.$inferSelect;

/** A forgotten-password link: the token's SHA-256, one use, short-lived. */
export const passwordResets = pgTable(
  'password_resets',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    userId: text('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    tokenHash: text('token_hash').notNull().unique(),
    expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
    usedAt: timestamp('used_at', { withTimezone: true }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('password_resets_user_idx').on(t.userId)],
);

/** account_address: failed sign-ins of one account from one address; address: from one address; mail: e-mails sent. */
export const throttleKinds = ['account_address', 'address', 'mail'] as const;
export type ThrottleKind = (typeof throttleKinds)[number];
export const throttleKindEnum = pgEnum('throttle_kind', throttleKinds);

/**
 * One row per counted event (a failed sign-in per account-and-address pair and per address, a
 * mail sent per e-mail address); the throttle counts rows inside a sliding window.
 */
export const throttleEvents = pgTable(
  'throttle_events',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    kind: throttleKindEnum('kind').notNull(),
    key: text('key').notNull(),
    at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('throttle_events_key_idx').on(t.kind, t.key, t.at)],
);
