// Security headers on every kind of answer: a page, an API route (also its errors), a built static
// asset and a file from public/. Header semantics: W3C Content Security Policy Level 3 (script-src,
// style-src, frame-ancestors; hash sources are base64 SHA-256 of the element's text), the Fetch
// standard (X-Content-Type-Options: nosniff), W3C Referrer Policy.
import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { baseUrl } from '../support/browser';
import { signInAs } from '../support/session';

/** The directives of a Content-Security-Policy header, by name. */
function directives(header: string | null): Map<string, string[]> {
  const out = new Map<string, string[]>();
  for (const part of (header ?? '').split(';')) {
    const [name, ...values] = part.trim().split(/\s+/);
    if (name) out.set(name.toLowerCase(), values);
  }
  return out;
}

function expectCommonHeaders(res: Response, what: string): void {
  expect(res.headers.get('x-content-type-options'), what).toBe('nosniff');
  expect(res.headers.get('referrer-policy'), what).toBe('same-origin');
  const csp = directives(res.headers.get('content-security-policy'));
  expect(csp.get('frame-ancestors'), what).toEqual(["'none'"]);
  // No plugins, whether said outright or through default-src.
  expect(csp.get('object-src') ?? csp.get('default-src'), what).toEqual(["'none'"]);
  // No version banners (Astro and Node send none; keep it so).
  expect(res.headers.get('server'), what).toBeNull();
  expect(res.headers.get('x-powered-by'), what).toBeNull();
}

const sha256 = (text: string) => `'sha256-${createHash('sha256').update(text, 'utf8').digest('base64')}'`;
const inline = (html: string, tag: 'script' | 'style') =>
  [...html.matchAll(new RegExp(`<${tag}(\\s[^>]*)?>([\\s\\S]*?)</${tag}>`, 'g'))]
    .filter((m) => !/\ssrc=/.test(m[1] ?? ''))
    .map((m) => m[2]);

describe('security headers', () => {
  it('a page with an island allows exactly its own inline scripts and styles, by hash', async () => {
    const cookie = await signInAs(baseUrl(), 'operator');
    const res = await fetch(`${baseUrl()}/fleet`, { headers: { cookie } });
    expect(res.status).toBe(200);
    expectCommonHeaders(res, '/fleet');
    const csp = directives(res.headers.get('content-security-policy'));
    const html = await res.text();
    const scripts = inline(html, 'script');
    expect(scripts.length).toBeGreaterThan(0); // the island loader is inline
    const scriptSrc = csp.get('script-src') ?? [];
    expect(scriptSrc).not.toContain("'unsafe-inline'");
    expect(scriptSrc).not.toContain("'unsafe-eval'");
    for (const s of scripts) expect(scriptSrc, 'each inline script is listed by hash').toContain(sha256(s));
    const styleSrc = csp.get('style-src') ?? [];
    expect(styleSrc).not.toContain("'unsafe-inline'");
    for (const s of inline(html, 'style')) expect(styleSrc, 'each inline style is listed by hash').toContain(sha256(s));
    expect(csp.get('default-src')).toEqual(["'self'"]);
    expect(csp.get('base-uri')).toEqual(["'self'"]);
    expect(csp.get('form-action')).toEqual(["'self'"]);
  });

  it('the sign-in page and the not-found page carry them too', async () => {
    for (const path of ['/signin', '/no-such-page']) {
      const res = await fetch(`${baseUrl()}${path}`);
      expectCommonHeaders(res, path);
      expect(directives(res.headers.get('content-security-policy')).get('script-src')).not.toContain("'unsafe-inline'");
    }
  });

  it('API answers, errors included, forbid everything but being read', async () => {
    const answers = [
      await fetch(`${baseUrl()}/api/health`),
      await fetch(`${baseUrl()}/api/tanks`), // 401: signed out
    ];
    expect(answers.map((r) => r.status)).toEqual([200, 401]);
    for (const res of answers) {
      expectCommonHeaders(res, res.url);
      expect(directives(res.headers.get('content-security-policy')).get('default-src'), res.url).toEqual(["'none'"]);
    }
    // An unknown API address is answered through the not-found page's route, with that page's policy.
    const missing = await fetch(`${baseUrl()}/api/no-such-endpoint`);
    expect(missing.status).toBe(404);
    expectCommonHeaders(missing, missing.url);
  });

  it('built assets and public files carry them', async () => {
    const html = await (await fetch(`${baseUrl()}/signin`)).text();
    const css = html.match(/href="(\/_astro\/[^"]+\.css)"/)?.[1];
    expect(css, 'the page links a built stylesheet').toBeTruthy();
    for (const path of [css!, '/favicon.svg']) {
      const res = await fetch(`${baseUrl()}${path}`);
      expect(res.status, path).toBe(200);
      expectCommonHeaders(res, path);
    }
  });
});
