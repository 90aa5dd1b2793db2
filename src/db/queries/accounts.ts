import { and, asc, eq, gt, ne, sql } from 'drizzle-orm';
import { db } from '..';
import { companies, homeMembers, homes, memberships, userSessions, users, type Role } from '../schema';
import type { Viewer } from '../../lib/server/viewer';

export interface SignInCandidate {
  id: string;
  email: string;
  name: string | null;
  passwordHash: string | null;
  companyId: string | null;
}

/** The account an address belongs to, with its company (the oldest membership), or null. */
export async function findAccountByEmail(email: string): Promise<SignInCandidate | null> {
  const rows = await db()
    .select({
      id: users.id,
      email: users.email,
      name: users.name,
      passwordHash: users.passwordHash,
      companyId: memberships.companyId,
    })
    .from(users)
    .leftJoin(memberships, eq(memberships.userId, users.id))
    .where(eq(sql`lower(${users.email})`, email.toLowerCase()))
    .orderBy(asc(memberships.createdAt))
    .limit(1);
  return rows[0] ?? null;
}

/** The company an account belongs to (its oldest membership), or null. */
export async function companyOfUser(userId: string): Promise<string | null> {
  const rows = await db()
    .select({ companyId: memberships.companyId })
    .from(memberships)
    .where(eq(memberships.userId, userId))
    .orderBy(asc(memberships.createdAt))
    .limit(1);
  return rows[0]?.companyId ?? null;
}

/**
 * Who a session belongs to, read fresh on every request. Null when the session is no longer on
 * record (signed out, or ended by a reset, a role change or a removal), has expired, or the
 * account or its membership is gone.
 */
export async function viewerForSession(userId: string, sessionId: string): Promise<Viewer | null> {
  const [row] = await db()
    .select({
      userId: users.id,
      email: users.email,
      name: users.name,
      companyId: companies.id,
      companyName: companies.name,
      role: memberships.role,
    })
    .from(users)
    // The session must still be on record: signing out, a reset, a role change or a removal deletes it.
    .innerJoin(
      userSessions,
      and(eq(userSessions.id, sessionId), eq(userSessions.userId, users.id), gt(userSessions.expiresAt, sql`now()`)),
    )
    .innerJoin(memberships, eq(memberships.userId, users.id))
    .innerJoin(companies, eq(companies.id, memberships.companyId))
    .where(eq(users.id, userId))
    .orderBy(asc(memberships.createdAt))
    .limit(1);
  if (!row) return null;
  let homeIds: string[] | null = null;
  if (row.role === 'householder') {
    const linked = await db()
      .select({ id: homes.id })
      .from(homeMembers)
      .innerJoin(homes, and(eq(homes.id, homeMembers.homeId), eq(homes.companyId, row.companyId)))
      .where(eq(homeMembers.userId, userId));
    homeIds = linked.map((h) => h.id);
  }
  return {
    userId: row.userId,
    email: row.email,
    name: row.name,
    companyId: row.companyId,
    companyName: row.companyName,
    role: row.role,
    homeIds,
  };
}

export interface StaffMember {
  userId: string;
  email: string;
  name: string | null;
  role: Role;
  since: Date;
}

/** The columns of a StaffMember. */
const staffMemberColumns = {
  userId: users.id,
  email: users.email,
  name: users.name,
  role: memberships.role,
  since: memberships.createdAt,
};

/** The company's staff (every role but householder), by role then name. */
export async function listStaff(companyId: string): Promise<StaffMember[]> {
  return db()
    .select(staffMemberColumns)
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.companyId, companyId), ne(memberships.role, 'householder')))
    .orderBy(asc(memberships.role), asc(users.email));
}

/** One member of the company, or null when the person is not a member (any other company: not found). */
export async function findMember(companyId: string, userId: string): Promise<StaffMember | null> {
  const [row] = await db()
    .select(staffMemberColumns)
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.companyId, companyId), eq(memberships.userId, userId)));
  return row ?? null;
}

/** Householders linked to a home (the home must already be known to be in scope). */
export async function listHomeHouseholders(
  homeId: string,
): Promise<{ userId: string; email: string; name: string | null }[]> {
  return db()
    .select({ userId: users.id, email: users.email, name: users.name })
    .from(homeMembers)
    .innerJoin(users, eq(users.id, homeMembers.userId))
    .where(eq(homeMembers.homeId, homeId))
    .orderBy(asc(users.email));
}
