import { addEvent, clearEvents, clearEventsWithPrefix, recentEvents } from '../../db/queries/throttle';
import type { ThrottleKind } from '../../db/schema';

/**
 * Limits on repeated failures (OWASP Authentication Cheat Sheet, "Protect against automated
 * attacks"; NIST SP 800-63B §5.2.2 asks for rate limiting of failed attempts). The numbers are
 * ours (common practice).
 *
 * - Per account *and* address: after 5 failures, each further try from that address for that
 *   account waits a delay that doubles per failure (1 minute, 2, 4 … at most an hour). The
 *   person signing in from their own address is not held back by someone else's failures
 *   elsewhere: an attacker cannot lock anyone out by guessing at their account.
 * - Per address, across accounts (password spraying): 30 failures in 15 minutes block that
 *   address for the rest of the window. Looser, as an office may share one router.
 * An account is counted by the address typed, whether or not an account exists, so the delay
 * reveals nothing either. E-mails (sign-in links, resets) are limited to 5 an hour per e-mail address.
 */
export const throttlePolicy = {
  accountAddress: { freeFailures: 5, firstDelayMs: 60_000, maxDelayMs: 60 * 60_000, windowMs: 24 * 3600_000 },
  address: { limit: 30, windowMs: 15 * 60_000 },
  mail: { limit: 5, windowMs: 60 * 60_000 },
} as const;

export type ThrottleVerdict = { blocked: false } | { blocked: true; retryAfterS: number };

const open: ThrottleVerdict = { blocked: false };
const wait = (untilMs: number, nowMs: number): ThrottleVerdict => ({
  blocked: true,
  retryAfterS: Math.max(1, Math.ceil((untilMs - nowMs) / 1000)),
});

/** The wait after `failures` failures of one account from one address (0 while tries are free). */
export function backOffMs(failures: number): number {
  const p = throttlePolicy.accountAddress;
  if (failures < p.freeFailures) return 0;
  return Math.min(p.maxDelayMs, p.firstDelayMs * 2 ** (failures - p.freeFailures));
}

/** Exponential back-off: blocked until the last failure plus the delay its count earns. */
export function backOffVerdict(failures: number, lastFailure: Date | null, now = Date.now()): ThrottleVerdict {
  const delay = backOffMs(failures);
  if (!delay || !lastFailure || lastFailure.getTime() + delay <= now) return open;
  return wait(lastFailure.getTime() + delay, now);
}

/** A fixed window: blocked once `limit` events are inside it, until the oldest leaves. */
async function windowVerdict(kind: Exclude<ThrottleKind, 'account_address'>, key: string): Promise<ThrottleVerdict> {
  const { limit, windowMs } = throttlePolicy[kind];
  const { count, oldest } = await recentEvents(kind, key, windowMs);
  if (count < limit || !oldest) return open;
  return wait(oldest.getTime() + windowMs, Date.now());
}

/** The key of one account at one address (e-mail addresses hold no spaces once validated). */
const pairKey = (email: string, address: string) => `${email} ${address}`;

/** Whether a sign-in attempt for this account from this address may even be checked. */
export async function signInVerdict(email: string, address: string): Promise<ThrottleVerdict> {
  const [pairEvents, addr] = await Promise.all([
    recentEvents('account_address', pairKey(email, address), throttlePolicy.accountAddress.windowMs),
    windowVerdict('address', address),
  ]);
  const pair = backOffVerdict(pairEvents.count, pairEvents.newest);
  if (!pair.blocked) return addr;
  if (!addr.blocked) return pair;
  return { blocked: true, retryAfterS: Math.max(pair.retryAfterS, addr.retryAfterS) };
}

export async function recordSignInFailure(email: string, address: string): Promise<void> {
  await Promise.all([addEvent('account_address', pairKey(email, address)), addEvent('address', address)]);
}

/** A correct password clears this account's failures from this address (the address keeps its own count). */
export async function clearSignInFailures(email: string, address: string): Promise<void> {
  await clearEvents('account_address', pairKey(email, address));
}

/** A completed password reset proves the mailbox: the account's failures from every address are cleared. */
export async function clearAccountFailures(email: string): Promise<void> {
  await clearEventsWithPrefix('account_address', `${email} `);
}

/** Counts one e-mail to this address; false when the hourly allowance is spent (send nothing). */
export async function takeMailAllowance(email: string): Promise<boolean> {
  if ((await windowVerdict('mail', email)).blocked) return false;
  await addEvent('mail', email);
  return true;
}
