// Debian's Chromium driven by playwright-core (never a downloaded browser).
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { chromium, type Browser, type Page } from 'playwright-core';

export const baseUrl = (): string => {
  const url = process.env.TEST_BASE_URL;
  if (!url) throw new Error('TEST_BASE_URL is not set: run the browser tests through `npm test`.');
  return url;
};

/** `extraArgs`, e.g. Chromium's fake camera for the barcode scanner. */
export function launchBrowser(extraArgs: string[] = []): Promise<Browser> {
  return chromium.launch({
    executablePath: '/usr/bin/chromium',
    headless: true,
    // The machine's network is closed: keep Chromium from phoning home at every start.
    args: [
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
      ...extraArgs,
    ],
  });
}

/** Waits until every React island on the page has hydrated, so typing and clicks reach React. */
export async function waitForIslands(page: Page): Promise<void> {
  await page.waitForFunction(() => document.querySelectorAll('astro-island[ssr]').length === 0, undefined, {
    timeout: 20_000,
  });
}

const shotDir = new URL('../../test-results/screenshots', import.meta.url).pathname;

/** Saves a screenshot under test-results/screenshots for people to look at. */
export async function screenshot(page: Page, name: string): Promise<string> {
  mkdirSync(shotDir, { recursive: true });
  const path = join(shotDir, `${name}.png`);
  await page.screenshot({ path, fullPage: true });
  return path;
}
