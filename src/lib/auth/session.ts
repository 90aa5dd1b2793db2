import type { AstroCookies } from 'astro';
import { decode, encode } from '@auth/core/jwt';
import { createUserSession } from '../../db/queries/sessions';
import { isUuid } from '../../db/queries/scope';
import { env } from '../server/env';

/**
 * The session is Auth.js's own JWT cookie (strategy 'jwt': the credentials provider needs it),
 * carrying `sid`, the id of our server-side record of it (`user_sessions`): the cookie alone is
 * not enough, the record must still exist, so signing out ends a session even if the cookie was
 * copied. These helpers read the cookie on every request and write it after an invitation or a
 * password reset, so that those flows land the person signed in with the cookie Auth.js sets.
 */
export const SESSION_MAX_AGE_S = 7 * 24 * 3600;

/** Auth.js's cookie names: the __Secure- prefix when served over HTTPS. */
function sessionCookieName(secure: boolean): string {
  return `${secure ? '__Secure-' : ''}authjs.session-token`;
}

export function authSecret(): string {
  const secret = env().AUTH_SECRET;
  if (!secret)
    throw new Error(
      'AUTH_SECRET is not set: `npm start` generates one; set it (32+ characters) when running the server yourself.',
    );
  return secret;
}

export interface Session {
  userId: string;
  /** The id of the server-side session record. */
  sessionId: string;
}

/** Starts a server-side session for a person signing in; its id goes into the token as `sid`. */
export function startSession(userId: string): Promise<string> {
  return createUserSession(userId, SESSION_MAX_AGE_S);
}

/**
 * The session named by the request's cookie, or null (absent, forged, expired, or issued before
 * sessions had ids). Whether it is still on record is the viewer query's check.
 */
export async function getSession(cookies: AstroCookies, secure: boolean): Promise<Session | null> {
  const name = sessionCookieName(secure);
  const value = cookies.get(name)?.value;
  if (!value) return null;
  try {
    const token = await decode({ token: value, secret: authSecret(), salt: name });
    if (!token?.sub || typeof token.sid !== 'string' || !isUuid(token.sid)) return null;
    return { userId: token.sub, sessionId: token.sid };
  } catch {
    return null;
  }
}

/** Drops the session cookie (after signing out everywhere, or when its session has ended). */
export function clearSessionCookie(cookies: AstroCookies, secure: boolean): void {
  cookies.delete(sessionCookieName(secure), { path: '/' });
}

function sessionCookieOptions(secure: boolean) {
  return { httpOnly: true, sameSite: 'lax' as const, path: '/', secure };
}

/** Signs the person in: the same token and cookie Auth.js issues after a password sign-in. */
export async function issueSession(
  cookies: AstroCookies,
  user: { id: string; email: string; name: string | null },
  secure: boolean,
): Promise<void> {
  const name = sessionCookieName(secure);
  const token = await encode({
    token: { sub: user.id, email: user.email, name: user.name, sid: await startSession(user.id) },
    secret: authSecret(),
    salt: name,
    maxAge: SESSION_MAX_AGE_S,
  });
  cookies.set(name, token, {
    ...sessionCookieOptions(secure),
    expires: new Date(Date.now() + SESSION_MAX_AGE_S * 1000),
  });
}
