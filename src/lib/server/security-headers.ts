// The security headers of every answer the web server gives: pages, API routes, built assets and
// files from public/. Pages carry Astro's own Content-Security-Policy (`experimental.csp` in
// astro.config.mjs): script-src and style-src are 'self' plus the hashes of the inline scripts and
// styles Astro emits (the island loader), so no other inline script runs; the other directives come
// from `pageCspDirectives` here. Every other answer gets `resourceCsp`: JSON and files never need to
// run, load or be framed. Semantics: W3C Content Security Policy Level 3, W3C Referrer Policy,
// WHATWG Fetch (X-Content-Type-Options).
import type { ServerResponse } from 'node:http';

/** A page's directives beside the script-src and style-src that Astro writes with its hashes. */
/** A CSP directive with its value (typed so Astro's `experimental.csp.directives` accepts it). */
type Directive =
  `${'default-src' | 'connect-src' | 'font-src' | 'img-src' | 'object-src' | 'base-uri' | 'form-action' | 'frame-ancestors'} ${string}`;

export const pageCspDirectives: Directive[] = [
  "default-src 'self'",
  "connect-src 'self'",
  "font-src 'self'",
  "img-src 'self'",
  "object-src 'none'",
  "base-uri 'self'",
  "form-action 'self'",
  "frame-ancestors 'none'",
];

/** Everything that is not a page: nothing in it may run or load, and no site may frame it. */
const resourceCsp = "default-src 'none'; frame-ancestors 'none'; base-uri 'none'; form-action 'none'";

/** Headers every answer carries. */
const securityHeaders: Readonly<Record<string, string>> = {
  'Content-Security-Policy': resourceCsp,
  // Browsers take the declared Content-Type only, never a type guessed from the bytes (uploads).
  'X-Content-Type-Options': 'nosniff',
  // Addresses here carry tank and home ids: other sites get no referrer at all.
  'Referrer-Policy': 'same-origin',
};

/**
 * Sets the headers before the app answers. Node merges them with the app's own, the app's winning
 * (`writeHead`), so a page's Content-Security-Policy from Astro replaces the default one.
 */
export function setSecurityHeaders(res: ServerResponse): void {
  for (const [name, value] of Object.entries(securityHeaders)) res.setHeader(name, value);
}
