import { and, eq, isNull } from 'drizzle-orm';
import { db } from '..';
import { passwordResets, users } from '../schema';
import { companyOfUser } from './accounts';
import { recordAudit } from './audit';
import { endAllUserSessions } from './sessions';

export async function createPasswordReset(userId: string, tokenHash: string, expiresAt: Date): Promise<void> {
  await db().insert(passwordResets).values({ userId, tokenHash, expiresAt });
}

export type ResetOutcome =
  | { ok: true; user: { id: string; email: string; name: string | null } }
  | { ok: false; reason: 'not_found' | 'used' | 'expired' };

/**
 * Uses a reset link once: sets the new password and ends every session of the account (the
 * person is signed out everywhere; the caller then signs this browser in afresh). Any other reset links of the account stop working.
 */
export async function completePasswordReset(
  tokenHash: string,
  passwordHash: string,
  address: string,
): Promise<ResetOutcome> {
  return db().transaction(async (tx) => {
    const [reset] = await tx.select().from(passwordResets).where(eq(passwordResets.tokenHash, tokenHash)).for('update');
    if (!reset) return { ok: false, reason: 'not_found' };
    if (reset.usedAt) return { ok: false, reason: 'used' };
    if (reset.expiresAt <= new Date()) return { ok: false, reason: 'expired' };
    const now = new Date();
    await tx
      .update(passwordResets)
      .set({ usedAt: now })
      .where(and(eq(passwordResets.userId, reset.userId), isNull(passwordResets.usedAt)));
    const [user] = await tx
      .update(users)
      .set({ passwordHash })
      .where(eq(users.id, reset.userId))
      .returning({ id: users.id, email: users.email, name: users.name });
    await endAllUserSessions(user.id, tx);
    await recordAudit(
      {
        companyId: await companyOfUser(user.id),
        actorUserId: user.id,
        action: 'password.reset',
        subject: `user:${user.id}`,
        detail: { address },
      },
      tx,
    );
    return { ok: true, user };
  });
}

/** The state of a reset link, for the page that shows the form. */
export async function passwordResetState(tokenHash: string): Promise<'valid' | 'not_found' | 'used' | 'expired'> {
  const [reset] = await db().select().from(passwordResets).where(eq(passwordResets.tokenHash, tokenHash));
  if (!reset) return 'not_found';
  if (reset.usedAt) return 'used';
  return reset.expiresAt <= new Date() ? 'expired' : 'valid';
}
