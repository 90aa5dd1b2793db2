// The main pages under their Content-Security-Policy in Chromium: nothing is refused (scripts,
// styles, fonts, charts, API calls), the islands hydrate and answer, and a script injected into the
// page is refused. Violations are the `securitypolicyviolation` events of W3C CSP Level 3 §5.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { createAccount } from '../../support/accounts';
import { baseUrl, launchBrowser, screenshot, waitForIslands } from '../../support/browser';
import { closeTestDb } from '../../support/db';
import { demoEmail, demoPassword, signIn, signInAs } from '../../support/session';
import { createFixture, dropFixture, type Fixture } from '../../integration/views/fixtures';
import { signedInContext } from '../views/helpers';

let browser: Browser;
let fx: Fixture;
beforeAll(async () => {
  [browser, fx] = await Promise.all([launchBrowser(), createFixture('kestrel-vale', 'Harrowby')]);
});
afterAll(async () => {
  await browser?.close();
  if (fx) await dropFixture(fx);
  await closeTestDb();
});

interface Watch {
  violations: () => Promise<string[]>;
  consoleErrors: string[];
}

/** Records every CSP violation the page reports (the listener is installed outside the page's policy). */
async function watchPolicy(page: Page): Promise<Watch> {
  await page.addInitScript(() => {
    const seen: string[] = [];
    (window as unknown as { cspViolations: string[] }).cspViolations = seen;
    document.addEventListener('securitypolicyviolation', (e) =>
      seen.push(`${e.effectiveDirective} refused ${e.blockedURI || 'inline'} (${e.sourceFile}:${e.lineNumber})`),
    );
  });
  const consoleErrors: string[] = [];
  page.on('console', (m) => {
    if (m.type() === 'error') consoleErrors.push(m.text());
  });
  page.on('pageerror', (e) => consoleErrors.push(`uncaught: ${e.message}`));
  return {
    consoleErrors,
    violations: async () => [
      ...(await page.evaluate(() => (window as unknown as { cspViolations: string[] }).cspViolations)),
      ...consoleErrors.filter((t) => /Content Security Policy/i.test(t)),
    ],
  };
}

/** Styles and both shipped font families arrived (@fontsource files under /_astro). */
async function expectStylesAndFonts(page: Page): Promise<void> {
  await page.evaluate(() => document.fonts.ready);
  const r = await page.evaluate(() => ({
    sans: document.fonts.check('16px "IBM Plex Sans"'),
    family: getComputedStyle(document.body).fontFamily,
    sheets: document.styleSheets.length,
  }));
  expect(r.sans).toBe(true);
  expect(r.family).toContain('IBM Plex Sans');
  expect(r.sheets).toBeGreaterThan(0);
}

describe('pages under their Content-Security-Policy in Chromium', () => {
  it('signs in through the form and works the fleet list, with nothing refused', async () => {
    const context = await browser.newContext({
      viewport: { width: 1440, height: 1000 },
      locale: 'en-GB',
      timezoneId: 'UTC',
    });
    const page = await context.newPage();
    const watch = await watchPolicy(page);
    await page.goto(`${baseUrl()}/signin?next=/fleet`);
    await expectStylesAndFonts(page);
    await page.getByLabel('E-mail address').fill(demoEmail('operator', 'kestrel-vale'));
    await page.getByLabel('Password').fill(demoPassword());
    await page.getByRole('button', { name: 'Sign in', exact: true }).click();
    await page.waitForURL('**/fleet');
    await waitForIslands(page);
    await page.getByLabel('Search', { exact: true }).fill(fx.faulty.serial);
    await page.locator('tbody tr', { hasText: fx.faulty.serial }).waitFor({ timeout: 20_000 });
    await expect.poll(() => page.locator('tbody tr').count(), { timeout: 20_000 }).toBe(1);
    await expectStylesAndFonts(page);
    await screenshot(page, 'csp-fleet');
    expect(await watch.violations()).toEqual([]);

    // The policy is enforced: an inline script put into the page does not run, and is reported.
    const ran = await page.evaluate(async () => {
      const s = document.createElement('script');
      s.textContent = 'window.injectedRan = true';
      document.head.append(s);
      await new Promise((r) => setTimeout(r, 100));
      return (window as unknown as { injectedRan?: boolean }).injectedRan ?? false;
    });
    expect(ran).toBe(false);
    expect((await watch.violations()).some((v) => v.startsWith('script-src'))).toBe(true);
    await context.close();
  });

  it("draws a tank page's charts and changes its range, with nothing refused", async () => {
    const context = await signedInContext(browser, await signInAs(baseUrl(), 'engineer'));
    const page = await context.newPage();
    const watch = await watchPolicy(page);
    await page.goto(`${baseUrl()}/tanks/${fx.healthy.id}`);
    await waitForIslands(page);
    await page.getByText('every reading').first().waitFor();
    await page.locator('.uplot canvas').first().waitFor();
    await page.getByRole('radio', { name: '7 days' }).click();
    await page.getByText('15-minute means').first().waitFor();
    await expectStylesAndFonts(page);
    // Figures are set in the monospace face.
    await expect(page.evaluate(() => document.fonts.check('16px "IBM Plex Mono"'))).resolves.toBe(true);
    await screenshot(page, 'csp-tank');
    expect(await watch.violations()).toEqual([]);
    await context.close();
  });

  it('shows a householder their hot water and saves their assumptions, with nothing refused', async () => {
    const person = await createAccount({
      company: 'kestrel-vale',
      role: 'householder',
      homeId: fx.healthy.homeId,
      label: 'csp-home',
    });
    const context = await signedInContext(browser, await signIn(baseUrl(), person.email, person.password), {
      width: 390,
      height: 844,
    });
    const page = await context.newPage();
    const watch = await watchPolicy(page);
    await page.goto(`${baseUrl()}/home`);
    await waitForIslands(page);
    await page.getByTestId('litres-now').waitFor();
    const before = await page.getByTestId('everyday').textContent();
    await page.getByText('How we count showers and baths').click();
    await page.getByLabel('Litres per shower').fill('60');
    await page.getByRole('button', { name: 'Save' }).click();
    await expect.poll(() => page.getByTestId('everyday').textContent()).not.toBe(before);
    await expectStylesAndFonts(page);
    await screenshot(page, 'csp-home');
    expect(await watch.violations()).toEqual([]);
    expect(watch.consoleErrors).toEqual([]);
    await context.close();
  });
});
