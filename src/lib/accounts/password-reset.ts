import { findAccountByEmail } from '../../db/queries/accounts';
import { recordAudit } from '../../db/queries/audit';
import { createPasswordReset } from '../../db/queries/password-resets';
import { passwordResetMail } from '../mail/messages';
import { sendMail } from '../mail/send';
import { takeMailAllowance } from '../auth/throttle';
import { newLinkToken } from '../auth/tokens';
import { siteUrl } from './invitations';

/** How long a reset link works (OWASP Forgot Password Cheat Sheet: short-lived, single use). */
export const RESET_MINUTES = 60;

/**
 * Sends a reset link if the address has an account; the caller answers the same either way.
 * The message goes out in the background so that the answer takes as long either way too.
 */
export async function requestPasswordReset(email: string, address: string): Promise<void> {
  const account = await findAccountByEmail(email);
  if (!account?.companyId) return;
  if (!(await takeMailAllowance(email))) return;
  const { token, hash } = newLinkToken();
  await createPasswordReset(account.id, hash, new Date(Date.now() + RESET_MINUTES * 60_000));
  await recordAudit({
    companyId: account.companyId,
    actorUserId: null,
    action: 'password.reset_requested',
    subject: `user:${account.id}`,
    detail: { address },
  });
  void sendMail({
    to: account.email,
    companyId: account.companyId,
    ...passwordResetMail(siteUrl(`/reset-password?token=${token}`), RESET_MINUTES),
  }).catch((err) => console.error('[accounts] could not send a reset link:', err));
}
