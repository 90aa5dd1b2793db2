import { z } from '@/lib/zod';
import { recordAudit } from '../../db/queries/audit';
import { findAccountByEmail } from '../../db/queries/accounts';
import { hashPassword, verifyPassword } from '../server/password';
import { clearSignInFailures, recordSignInFailure, signInVerdict } from './throttle';
import { normaliseEmail } from './tokens';

const passwordSignInSchema = z.object({
  email: z.string().trim().email('Enter an e-mail address.').max(320),
  password: z.string().min(1, 'Enter your password.').max(1024),
});

export type PasswordSignInResult =
  | { ok: true; user: { id: string; email: string; name: string | null } }
  | { ok: false; reason: 'credentials' }
  | { ok: false; reason: 'throttled'; retryAfterS: number };

// Verified against when the address has no account, so that an unknown address takes as long
// to refuse as a wrong password (no timing hint that an account exists).
let decoyHash: Promise<string> | undefined;

/**
 * Checks an e-mail and password, in this order: throttle (before any work), account, password.
 * Every refusal for a wrong password or an unknown address looks the same to the caller.
 */
export async function checkPasswordSignIn(input: unknown, address: string): Promise<PasswordSignInResult> {
  const parsed = passwordSignInSchema.safeParse(input);
  if (!parsed.success) return { ok: false, reason: 'credentials' };
  const email = normaliseEmail(parsed.data.email);
  const verdict = await signInVerdict(email, address);
  if (verdict.blocked) {
    const account = await findAccountByEmail(email);
    await recordAudit({
      companyId: account?.companyId ?? null,
      actorUserId: null,
      action: 'signin.throttled',
      subject: email,
      detail: { address },
    });
    return { ok: false, reason: 'throttled', retryAfterS: verdict.retryAfterS };
  }
  const account = await findAccountByEmail(email);
  const usable = account?.passwordHash && account.companyId;
  decoyHash ??= hashPassword('decoy password that matches nothing');
  const matches = await verifyPassword(usable ? account.passwordHash! : await decoyHash, parsed.data.password);
  if (!usable || !matches) {
    await recordSignInFailure(email, address);
    await recordAudit({
      companyId: account?.companyId ?? null,
      actorUserId: null,
      action: 'signin.failed',
      subject: email,
      detail: { address, method: 'password' },
    });
    return { ok: false, reason: 'credentials' };
  }
  await clearSignInFailures(email, address);
  await recordAudit({
    companyId: account.companyId,
    actorUserId: account.id,
    action: 'signin.succeeded',
    subject: `user:${account.id}`,
    detail: { address, method: 'password' },
  });
  return { ok: true, user: { id: account.id, email: account.email, name: account.name } };
}
