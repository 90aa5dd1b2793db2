import type { Browser, BrowserContext } from 'playwright-core';
import { baseUrl } from '../../support/browser';

/** A browser context signed in with the Cookie header `signIn()` returned. */
export async function signedInContext(
  browser: Browser,
  cookieHeader: string,
  viewport = { width: 1440, height: 1000 },
): Promise<BrowserContext> {
  const context = await browser.newContext({ viewport, locale: 'en-GB', timezoneId: 'UTC' });
  const url = new URL(baseUrl());
  await context.addCookies(
    cookieHeader.split('; ').map((pair) => {
      const eq = pair.indexOf('=');
      return {
        name: pair.slice(0, eq),
        value: pair.slice(eq + 1),
        domain: url.hostname,
        path: '/',
        httpOnly: true,
        sameSite: 'Lax' as const,
      };
    }),
  );
  return context;
}
