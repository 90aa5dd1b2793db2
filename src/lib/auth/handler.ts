import type { APIContext } from 'astro';
import { Auth } from '@auth/core';
import { clientAddress, isHttps } from '../server/request';
import { authConfig, clientAddressHeader } from './config';

/**
 * Hands a request to Auth.js (called directly, not through an integration: it reads its
 * secret at run time). The client's address travels in a header only we set, for the
 * per-address throttle inside the credentials check.
 */
export async function handleAuthRequest(context: APIContext): Promise<Response> {
  const headers = new Headers(context.request.headers);
  headers.set(clientAddressHeader, clientAddress(context));
  const init: RequestInit = { method: context.request.method, headers };
  if (context.request.method !== 'GET' && context.request.method !== 'HEAD') init.body = await context.request.arrayBuffer();
  return Auth(new Request(context.request.url, init), authConfig({ secure: isHttps(context) }));
}

/**
 * Auth.js's CSRF token for a form on one of our pages (sign-in, sign-out), issuing its cookie
 * when the browser has none yet. Asks Auth.js itself, so the token is exactly what it checks.
 */
export async function csrfTokenFor(context: Pick<APIContext, 'request' | 'url' | 'cookies' | 'clientAddress'>): Promise<string> {
  const url = new URL('/api/auth/csrf', context.url);
  const res = await Auth(new Request(url, { headers: { cookie: context.request.headers.get('cookie') ?? '' } }), authConfig({ secure: isHttps(context) }));
  const { csrfToken } = (await res.json()) as { csrfToken: string };
  for (const line of res.headers.getSetCookie()) {
    const [pair, ...attrs] = line.split(';');
    const eq = pair.indexOf('=');
    const name = pair.slice(0, eq).trim();
    if (!name.endsWith('authjs.csrf-token')) continue;
    // Auth.js wrote the value URL-encoded; Astro encodes again on the way out, so decode it first.
    context.cookies.set(name, decodeURIComponent(pair.slice(eq + 1)), {
      path: '/', httpOnly: true, sameSite: 'lax', secure: attrs.some((a) => a.trim().toLowerCase() === 'secure'),
    });
  }
  return csrfToken;
}
