import { env } from './env';

/** Facts about the incoming request that depend on whether a reverse proxy sits in front. */
interface RequestLike {
  request: Request;
  url: URL;
  clientAddress?: string;
}

/**
 * The client's address. The web process (scripts/web-server.ts) has already replaced
 * X-Forwarded-For with the address it resolved from the connection and TRUSTED_PROXIES
 * (src/lib/server/client-address.ts), and Astro's `clientAddress` reads that header.
 */
export function clientAddress(context: RequestLike): string {
  try {
    return context.clientAddress ?? 'unknown';
  } catch {
    // Astro throws when the adapter cannot tell (e.g. prerendering).
    return 'unknown';
  }
}

/** Served over HTTPS: AUTH_URL says so, or a trusted proxy terminated TLS for us. */
export function isHttps(context: RequestLike): boolean {
  const e = env();
  if (e.AUTH_URL?.startsWith('https:')) return true;
  // The web process drops X-Forwarded-Proto unless a trusted proxy sent it.
  if (e.TRUSTED_PROXIES.length && context.request.headers.get('x-forwarded-proto') === 'https') return true;
  return context.url.protocol === 'https:';
}

/** The origins our own pages are served from: AUTH_URL's and the one this request came to. */
function ownOrigins(context: RequestLike): Set<string> {
  const origins = new Set([context.url.origin]);
  const authUrl = env().AUTH_URL;
  if (authUrl) origins.add(new URL(authUrl).origin);
  return origins;
}

/**
 * A browser request from another site. Browsers send Origin on every cross-origin POST and
 * Sec-Fetch-Site on every request; a request with neither comes from a script, not a browser
 * page, and carries no ambient cookies an attacker could borrow.
 */
export function isCrossSite(context: RequestLike): boolean {
  const origin = context.request.headers.get('origin');
  if (origin && origin !== 'null') return !ownOrigins(context).has(origin);
  if (origin === 'null') return true;
  const site = context.request.headers.get('sec-fetch-site');
  return site === 'cross-site' || site === 'same-site';
}

/** A browser navigation (a plain form post) rather than a script's call: answer with a page, not JSON. */
export function isPageNavigation(context: RequestLike): boolean {
  const h = context.request.headers;
  return h.get('sec-fetch-mode') === 'navigate' || !!h.get('accept')?.includes('text/html');
}
