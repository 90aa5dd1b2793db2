import { index, pgEnum, pgTable, primaryKey, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { users } from './auth';

/** A service company: the tenant. Every row of company data carries its id. */
export const companies = pgTable('companies', {
  id: uuid('id').primaryKey().defaultRandom(),
  slug: text('slug').notNull().unique(),
  name: text('name').notNull(),
  emailDomain: text('email_domain').notNull(),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
});
export type Company = typeof companies.$inferSelect;

export const roles = ['admin', 'operator', 'engineer', 'householder'] as const;
export type Role = (typeof roles)[number];
/** Everyone of a service company who is not a householder: they see the whole fleet of their company. */
export const staffRoles = ['admin', 'operator', 'engineer'] as const satisfies readonly Role[];
export const roleEnum = pgEnum('role', roles);

/** One role per person per company. */
export const memberships = pgTable(
  'memberships',
  {
    userId: text('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    companyId: uuid('company_id')
      .notNull()
      .references(() => companies.id, { onDelete: 'cascade' }),
    role: roleEnum('role').notNull(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.userId, t.companyId] }), index('memberships_company_idx').on(t.companyId)],
);
export type Membership = typeof memberships.$inferSelect;
