import { addEvent, clearEvents, recentEvents } from '../../db/queries/throttle';
import type { ThrottleKind } from '../../db/schema';

/**
 * Limits on repeated failures (OWASP Authentication Cheat Sheet, "Protect against automated
 * attacks"; NIST SP 800-63B §5.2.2 asks for rate limiting of failed attempts). The numbers are
 * ours (common practice): an account locks for 15 minutes after 5 failures in 15 minutes, an
 * address after 20 (it may be an office behind one router). An account is counted by the
 * address typed, whether or not an account exists, so the lock reveals nothing either.
 * E-mails (sign-in links, password resets) are limited to 5 an hour per address.
 */
export const throttlePolicy: Record<ThrottleKind, { limit: number; windowMs: number }> = {
  account: { limit: 5, windowMs: 15 * 60_000 },
  address: { limit: 20, windowMs: 15 * 60_000 },
  mail: { limit: 5, windowMs: 60 * 60_000 },
};

export type ThrottleVerdict = { blocked: false } | { blocked: true; retryAfterS: number };

async function verdict(kind: ThrottleKind, key: string): Promise<ThrottleVerdict> {
  const { limit, windowMs } = throttlePolicy[kind];
  const { count, oldest } = await recentEvents(kind, key, windowMs);
  if (count < limit || !oldest) return { blocked: false };
  return { blocked: true, retryAfterS: Math.max(1, Math.ceil((oldest.getTime() + windowMs - Date.now()) / 1000)) };
}

/** Whether a sign-in attempt for this account from this address may even be checked. */
export async function signInVerdict(email: string, address: string): Promise<ThrottleVerdict> {
  const [account, addr] = await Promise.all([verdict('account', email), verdict('address', address)]);
  if (!account.blocked) return addr;
  if (!addr.blocked) return account;
  return { blocked: true, retryAfterS: Math.max(account.retryAfterS, addr.retryAfterS) };
}

export async function recordSignInFailure(email: string, address: string): Promise<void> {
  await Promise.all([addEvent('account', email), addEvent('address', address)]);
}

/** A correct password clears the account's count (the address keeps its own). */
export async function clearAccountFailures(email: string): Promise<void> {
  await clearEvents('account', email);
}

/** Counts one e-mail to this address; false when the hourly allowance is spent (send nothing). */
export async function takeMailAllowance(email: string): Promise<boolean> {
  if ((await verdict('mail', email)).blocked) return false;
  await addEvent('mail', email);
  return true;
}
