import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { baseUrl, launchBrowser, screenshot } from '../support/browser';

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe('app shell in Chromium', () => {
  it('serves the sign-in page with the product name, form and shipped fonts', async () => {
    const page = await browser.newPage();
    const external: string[] = [];
    page.on('request', (r) => {
      if (!r.url().startsWith(baseUrl()) && !r.url().startsWith('data:')) external.push(r.url());
    });
    await page.goto(`${baseUrl()}/signin`);
    await expect(page.title()).resolves.toBe('Sign in · Heatlayer');
    expect(await page.getByRole('heading', { level: 1 }).textContent()).toBe('Sign in to Heatlayer');
    expect(await page.getByLabel('E-mail address').count()).toBe(1);
    await page.evaluate(() => document.fonts.ready);
    const plexLoaded = await page.evaluate(() => document.fonts.check('16px "IBM Plex Sans"'));
    expect(plexLoaded).toBe(true);
    // Fonts and scripts come from our own server: nothing is fetched from elsewhere.
    expect(external).toEqual([]);
    await screenshot(page, 'signin');
    await page.close();
  });
});
