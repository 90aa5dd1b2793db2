import type { AstroCookies } from 'astro';
import { decode, encode } from '@auth/core/jwt';
import { env } from '../server/env';

/**
 * The session is Auth.js's own JWT cookie (strategy 'jwt': the credentials provider needs it).
 * These helpers read it on every request and write it after an invitation or a password reset,
 * so that those flows land the person signed in with exactly the cookie Auth.js itself sets.
 */
export const SESSION_MAX_AGE_S = 7 * 24 * 3600;

/** Auth.js's cookie names: the __Secure- prefix when served over HTTPS. */
export function sessionCookieName(secure: boolean): string {
  return `${secure ? '__Secure-' : ''}authjs.session-token`;
}

export function authSecret(): string {
  const secret = env().AUTH_SECRET;
  if (!secret) throw new Error('AUTH_SECRET is not set: `npm start` generates one; set it (32+ characters) when running the server yourself.');
  return secret;
}

export interface Session {
  userId: string;
  /** When the token was issued, in seconds since the epoch. */
  issuedAt: number | undefined;
}

/** The signed-in user from the request's session cookie, or null (absent, forged or expired). */
export async function getSession(cookies: AstroCookies, secure: boolean): Promise<Session | null> {
  const name = sessionCookieName(secure);
  const value = cookies.get(name)?.value;
  if (!value) return null;
  try {
    const token = await decode({ token: value, secret: authSecret(), salt: name });
    if (!token?.sub) return null;
    return { userId: token.sub, issuedAt: typeof token.iat === 'number' ? token.iat : undefined };
  } catch {
    return null;
  }
}

export function sessionCookieOptions(secure: boolean) {
  return { httpOnly: true, sameSite: 'lax' as const, path: '/', secure };
}

/** Signs the person in: the same token and cookie Auth.js issues after a password sign-in. */
export async function issueSession(cookies: AstroCookies, user: { id: string; email: string; name: string | null }, secure: boolean): Promise<void> {
  const name = sessionCookieName(secure);
  const token = await encode({
    token: { sub: user.id, email: user.email, name: user.name },
    secret: authSecret(),
    salt: name,
    maxAge: SESSION_MAX_AGE_S,
  });
  cookies.set(name, token, { ...sessionCookieOptions(secure), expires: new Date(Date.now() + SESSION_MAX_AGE_S * 1000) });
}
