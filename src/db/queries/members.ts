import { and, eq, sql } from 'drizzle-orm';
import { db, type Tx } from '..';
import { memberships, type Role } from '../schema';
import { recordAudit } from './audit';
import { endAllUserSessions } from './sessions';

export type MemberChange = { ok: true; from: Role } | { ok: false; reason: 'not_found' | 'last_admin' };

async function adminCount(tx: Tx, companyId: string): Promise<number> {
  const [{ n }] = await tx
    .select({ n: sql<number>`count(*)::int` })
    .from(memberships)
    .where(and(eq(memberships.companyId, companyId), eq(memberships.role, 'admin')));
  return n;
}

/**
 * Gives a staff member another staff role and ends their sessions. Householders are not staff
 * (404 here), and the company never loses its last administrator.
 */
export async function changeStaffRole(
  companyId: string,
  userId: string,
  role: Exclude<Role, 'householder'>,
  actorUserId: string,
): Promise<MemberChange> {
  return db().transaction(async (tx) => {
    const [m] = await tx
      .select()
      .from(memberships)
      .where(and(eq(memberships.companyId, companyId), eq(memberships.userId, userId)))
      .for('update');
    if (!m || m.role === 'householder') return { ok: false, reason: 'not_found' };
    if (m.role === 'admin' && role !== 'admin' && (await adminCount(tx, companyId)) <= 1)
      return { ok: false, reason: 'last_admin' };
    if (m.role !== role) {
      await tx
        .update(memberships)
        .set({ role })
        .where(and(eq(memberships.companyId, companyId), eq(memberships.userId, userId)));
      // They sign in again and see the app as their new role, with nothing left open from the old one.
      const sessionsEnded = await endAllUserSessions(userId, tx);
      await recordAudit(
        {
          companyId,
          actorUserId,
          action: 'member.role_changed',
          subject: `user:${userId}`,
          detail: { from: m.role, to: role, sessionsEnded },
        },
        tx,
      );
    }
    return { ok: true, from: m.role };
  });
}

/** Removes a staff member from the company and ends their sessions at once. */
export async function removeStaffMember(companyId: string, userId: string, actorUserId: string): Promise<MemberChange> {
  return db().transaction(async (tx) => {
    const [m] = await tx
      .select()
      .from(memberships)
      .where(and(eq(memberships.companyId, companyId), eq(memberships.userId, userId)))
      .for('update');
    if (!m || m.role === 'householder') return { ok: false, reason: 'not_found' };
    if (m.role === 'admin' && (await adminCount(tx, companyId)) <= 1) return { ok: false, reason: 'last_admin' };
    await tx.delete(memberships).where(and(eq(memberships.companyId, companyId), eq(memberships.userId, userId)));
    const sessionsEnded = await endAllUserSessions(userId, tx);
    await recordAudit(
      {
        companyId,
        actorUserId,
        action: 'member.removed',
        subject: `user:${userId}`,
        detail: { role: m.role, sessionsEnded },
      },
      tx,
    );
    return { ok: true, from: m.role };
  });
}
