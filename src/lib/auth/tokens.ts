import { createHash, randomBytes } from 'node:crypto';

/**
 * Link tokens (invitations, password resets): 32 random bytes, sent only in the e-mail; the
 * database keeps the SHA-256, so a copy of the database cannot be used to take over accounts.
 */
export function newLinkToken(): { token: string; hash: string } {
  const token = randomBytes(32).toString('base64url');
  return { token, hash: hashLinkToken(token) };
}

export function hashLinkToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}

/** E-mail addresses compare case-insensitively and without surrounding spaces. */
export function normaliseEmail(email: string): string {
  return email.trim().toLowerCase();
}
