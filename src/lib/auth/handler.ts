import type { APIContext } from 'astro';
import { Auth } from '@auth/core';
import { clientAddress, isHttps, isPageNavigation } from '../server/request';
import { authConfig, clientAddressHeader } from './config';
import { signInVerdict } from './throttle';
import { normaliseEmail } from './tokens';

/**
 * Hands a request to Auth.js (called directly, not through an integration: it reads its
 * secret at run time). The client's address travels in a header only we set, for the
 * per-address throttle inside the credentials check.
 */
export async function handleAuthRequest(context: APIContext): Promise<Response> {
  const headers = new Headers(context.request.headers);
  const address = clientAddress(context);
  headers.set(clientAddressHeader, address);
  const init: RequestInit = { method: context.request.method, headers };
  const body =
    context.request.method !== 'GET' && context.request.method !== 'HEAD'
      ? await context.request.arrayBuffer()
      : undefined;
  if (body) init.body = body;
  const res = await Auth(new Request(context.request.url, init), authConfig({ secure: isHttps(context) }));
  return throttledCode(res) && body ? throttledAnswer(context, res, body, address) : res;
}

/** Auth.js answers a refused password check with a redirect carrying ?code=; ours says 'throttled'. */
function throttledCode(res: Response): boolean {
  const location = res.headers.get('location');
  return !!location && new URL(location, 'http://x').searchParams.get('code') === 'throttled';
}

/**
 * A throttled sign-in says how long to wait: 429 with Retry-After for scripts; a browser's form
 * post keeps Auth.js's redirect to the sign-in page (which names the wait), with Retry-After too.
 */
async function throttledAnswer(
  context: APIContext,
  res: Response,
  body: ArrayBuffer,
  address: string,
): Promise<Response> {
  const email = normaliseEmail(new URLSearchParams(new TextDecoder().decode(body)).get('email') ?? '');
  const verdict = await signInVerdict(email, address);
  const retryAfterS = verdict.blocked ? verdict.retryAfterS : 1;
  const headers = new Headers(res.headers);
  headers.set('retry-after', String(retryAfterS));
  if (isPageNavigation(context)) {
    const location = new URL(res.headers.get('location')!, context.url);
    location.searchParams.set('retryAfter', String(retryAfterS));
    headers.set('location', location.pathname + location.search);
    return new Response(null, { status: res.status, headers });
  }
  headers.delete('location');
  headers.set('content-type', 'application/json');
  return new Response(
    JSON.stringify({ error: { code: 'TooManyAttempts', message: throttledMessage(retryAfterS), retryAfterS } }),
    { status: 429, headers },
  );
}

/** What a throttled person reads, on the sign-in page and in the 429 answer. */
export function throttledMessage(retryAfterS: number): string {
  const minutes = Math.max(1, Math.ceil(retryAfterS / 60));
  return `Too many failed sign-ins from this network. Try again in ${minutes} minute${minutes === 1 ? '' : 's'}, or ask for a sign-in link instead.`;
}

/**
 * Auth.js's CSRF token for a form on one of our pages (sign-in, sign-out), issuing its cookie
 * when the browser has none yet. Asks Auth.js itself, so the token is exactly what it checks.
 */
export async function csrfTokenFor(
  context: Pick<APIContext, 'request' | 'url' | 'cookies' | 'clientAddress'>,
): Promise<string> {
  const url = new URL('/api/auth/csrf', context.url);
  const res = await Auth(
    new Request(url, { headers: { cookie: context.request.headers.get('cookie') ?? '' } }),
    authConfig({ secure: isHttps(context) }),
  );
  const { csrfToken } = (await res.json()) as { csrfToken: string };
  for (const line of res.headers.getSetCookie()) {
    const [pair, ...attrs] = line.split(';');
    const eq = pair.indexOf('=');
    const name = pair.slice(0, eq).trim();
    if (!name.endsWith('authjs.csrf-token')) continue;
    // Auth.js wrote the value URL-encoded; Astro encodes again on the way out, so decode it first.
    context.cookies.set(name, decodeURIComponent(pair.slice(eq + 1)), {
      path: '/',
      httpOnly: true,
      sameSite: 'lax',
      secure: attrs.some((a) => a.trim().toLowerCase() === 'secure'),
    });
  }
  return csrfToken;
}
