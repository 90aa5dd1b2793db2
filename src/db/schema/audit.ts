import { bigserial, index, jsonb, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { users } from './auth';
import { companies } from './companies';

/**
 * Security-relevant actions (sign-in, role change, invitation, credential rotation, command
 * sent), append-only. `companyId` is null for events that belong to no company (a failed
 * sign-in for an unknown address); admins read their own company's rows.
 */
export const auditLog = pgTable(
  'audit_log',
  {
    id: bigserial('id', { mode: 'number' }).primaryKey(),
    companyId: uuid('company_id').references(() => companies.id, { onDelete: 'cascade' }),
    actorUserId: text('actor_user_id').references(() => users.id, { onDelete: 'set null' }),
    action: text('action').notNull(),
    /** What it was done to, as "kind:id" or an e-mail address. */
    subject: text('subject'),
    detail: jsonb('detail').$type<Record<string, unknown>>().notNull().default({}),
    at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('audit_log_company_idx').on(t.companyId, t.id)],
);
export type AuditEntry = typeof auditLog.$inferSelect;
