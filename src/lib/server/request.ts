import { env } from './env';

/**
 * Facts about the incoming request that depend on whether a reverse proxy sits in front.
 * X-Forwarded-* headers are believed only when TRUST_PROXY=1: otherwise anyone could claim
 * any address (and slip past the per-address sign-in throttle).
 */
interface RequestLike { request: Request; url: URL; clientAddress?: string }

export function clientAddress(context: RequestLike): string {
  if (env().TRUST_PROXY === '1') {
    const forwarded = context.request.headers.get('x-forwarded-for')?.split(',')[0]?.trim();
    if (forwarded) return forwarded;
  }
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
  if (e.TRUST_PROXY === '1' && context.request.headers.get('x-forwarded-proto') === 'https') return true;
  return context.url.protocol === 'https:';
}

/** The origins our own pages are served from: AUTH_URL's and the one this request came to. */
export function ownOrigins(context: RequestLike): Set<string> {
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
