import { type AnyColumn, and, eq, inArray, type SQL, type SQLWrapper, sql } from 'drizzle-orm';
import { homes, tanks } from '../schema';
import type { Scope } from '../../lib/server/authz';

/**
 * The tenancy filters, written once: every query that reads or writes company data adds one of
 * these to its WHERE clause, so a record outside the viewer's scope is simply not found.
 */
export function inScope(scope: Scope, company: AnyColumn, home: AnyColumn | SQLWrapper): SQL {
  return and(eq(company, scope.companyId), homeIdsFilter(scope, home))!;
}

export const homeInScope = (scope: Scope): SQL => inScope(scope, homes.companyId, homes.id);
export const tankInScope = (scope: Scope): SQL => inScope(scope, tanks.companyId, tanks.homeId);

function homeIdsFilter(scope: Scope, home: AnyColumn | SQLWrapper): SQL | undefined {
  if (scope.homeIds === null) return undefined;
  // A householder linked to no home sees nothing (inArray with an empty list is not valid SQL).
  return scope.homeIds.length > 0 ? inArray(home, [...scope.homeIds]) : sql`false`;
}

/** The same filter in raw SQL, for queries that name the tanks table `t`. */
export function scopeWhere(scope: Scope): SQL {
  if (scope.homeIds === null) return sql`t.company_id = ${scope.companyId}`;
  if (scope.homeIds.length === 0) return sql`false`;
  return sql`t.company_id = ${scope.companyId} and t.home_id = any(string_to_array(${scope.homeIds.join(',')}, ',')::uuid[])`;
}

/** True when the string is a UUID; anything else cannot name a row and is "not found". */
export function isUuid(value: string | undefined): value is string {
  return !!value && /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(value);
}
