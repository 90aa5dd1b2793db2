// Signing in from tests the standard Auth.js way: GET /api/auth/csrf, then POST
// /api/auth/callback/credentials with the token, form-encoded. Returns a Cookie header value.
import type { Role } from '../../src/db/schema/companies';

export type DemoCompanySlug = 'kestrel-vale' | 'orrin-bay';

const domains: Record<DemoCompanySlug, string> = {
  'kestrel-vale': 'kestrelvale.example.com',
  'orrin-bay': 'orrinbay.example.com',
};

/** The seeded demo account for a role (password: DEMO_PASSWORD, default heatlayer-demo). */
export function demoEmail(role: Role, company: DemoCompanySlug): string {
  return `${role}@${domains[company]}`;
}

export const demoPassword = (): string => process.env.DEMO_PASSWORD ?? 'heatlayer-demo';

/** name=value pairs from a response's Set-Cookie headers (expired ones dropped). */
export function cookiesFrom(res: Response): Map<string, string> {
  const out = new Map<string, string>();
  for (const line of res.headers.getSetCookie()) {
    const pair = line.split(';')[0];
    const eq = pair.indexOf('=');
    const value = pair.slice(eq + 1);
    if (value && !/max-age=0|expires=thu, 01 jan 1970/i.test(line)) out.set(pair.slice(0, eq), value);
  }
  return out;
}

export const cookieHeader = (jar: Map<string, string>): string => [...jar].map(([k, v]) => `${k}=${v}`).join('; ');

/** Auth.js's CSRF token and the cookie that goes with it. */
export async function csrf(
  baseUrl: string,
  extraHeaders: Record<string, string> = {},
): Promise<{ token: string; jar: Map<string, string> }> {
  const res = await fetch(`${baseUrl}/api/auth/csrf`, { headers: extraHeaders });
  if (!res.ok) throw new Error(`GET /api/auth/csrf answered ${res.status}`);
  const { csrfToken } = (await res.json()) as { csrfToken: string };
  return { token: csrfToken, jar: cookiesFrom(res) };
}

/**
 * Attempts a password sign-in and returns the raw answer (a redirect) and the cookie jar.
 * `headers` lets a test act from another address (X-Forwarded-For) or over HTTPS (X-Forwarded-Proto).
 */
export async function attemptSignIn(
  baseUrl: string,
  email: string,
  password: string,
  headers: Record<string, string> = {},
): Promise<{ res: Response; jar: Map<string, string> }> {
  const { token, jar } = await csrf(baseUrl, headers);
  const res = await fetch(`${baseUrl}/api/auth/callback/credentials`, {
    method: 'POST',
    redirect: 'manual',
    headers: {
      'content-type': 'application/x-www-form-urlencoded',
      origin: baseUrl,
      cookie: cookieHeader(jar),
      ...headers,
    },
    body: new URLSearchParams({ csrfToken: token, email, password, callbackUrl: '/' }),
  });
  for (const [k, v] of cookiesFrom(res)) jar.set(k, v);
  return { res, jar };
}

/** Signs in and returns a Cookie header value for fetch; throws naming Auth.js's error otherwise. */
export async function signIn(baseUrl: string, email: string, password: string): Promise<string> {
  const { res, jar } = await attemptSignIn(baseUrl, email, password);
  if (![...jar.keys()].some((k) => k.endsWith('authjs.session-token'))) {
    throw new Error(`Sign-in as ${email} failed: ${res.status} → ${res.headers.get('location') ?? '(no redirect)'}`);
  }
  return cookieHeader(jar);
}

/** Signs in as a seeded demo account. */
export function signInAs(baseUrl: string, role: Role, company: DemoCompanySlug = 'kestrel-vale'): Promise<string> {
  return signIn(baseUrl, demoEmail(role, company), demoPassword());
}

/** Signs out the standard Auth.js way (POST /api/auth/signout with its CSRF token); returns the answer. */
export async function signOut(baseUrl: string, sessionCookie: string): Promise<Response> {
  const { token, jar } = await csrf(baseUrl, { cookie: sessionCookie });
  return fetch(`${baseUrl}/api/auth/signout`, {
    method: 'POST',
    redirect: 'manual',
    headers: {
      'content-type': 'application/x-www-form-urlencoded',
      origin: baseUrl,
      cookie: `${sessionCookie}; ${cookieHeader(jar)}`,
    },
    body: new URLSearchParams({ csrfToken: token, callbackUrl: '/signin?signedOut=1' }),
  });
}
