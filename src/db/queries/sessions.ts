import { and, eq, lt } from 'drizzle-orm';
import { db } from '..';
import { userSessions } from '../schema';

type Writer = Pick<ReturnType<typeof db>, 'delete'>;

/** Records a new signed-in session and returns its id (the cookie's `sid`); drops the person's expired ones. */
export async function createUserSession(userId: string, maxAgeS: number): Promise<string> {
  const now = Date.now();
  await db()
    .delete(userSessions)
    .where(and(eq(userSessions.userId, userId), lt(userSessions.expiresAt, new Date(now))));
  const [row] = await db()
    .insert(userSessions)
    .values({ userId, expiresAt: new Date(now + maxAgeS * 1000) })
    .returning({ id: userSessions.id });
  return row.id;
}

/** Ends one session (signing out). */
export async function endUserSession(sessionId: string): Promise<void> {
  await db().delete(userSessions).where(eq(userSessions.id, sessionId));
}

/**
 * Ends every session of a person: "sign out everywhere", a password reset, a role change, a
 * removal. Pass the transaction that makes the change, so both happen or neither. Returns how many ended.
 */
export async function endAllUserSessions(userId: string, tx: Writer = db()): Promise<number> {
  const ended = await tx.delete(userSessions).where(eq(userSessions.userId, userId)).returning({ id: userSessions.id });
  return ended.length;
}
