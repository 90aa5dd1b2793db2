// In Chromium: the desk reads the fleet's energy averages and its outliers, and an outlier opens its tank.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { baseUrl, launchBrowser, screenshot, waitForIslands } from '../../support/browser';
import { closeTestDb } from '../../support/db';
import { dropCompany, homeWithDays, ownCompany, staffOf } from '../../integration/energy/fixtures';
import { signedInContext } from '../views/helpers';

const DAY_MS = 86_400_000;
const dateOf = (ms: number) => new Date(ms).toISOString().slice(0, 10);
let browser: Browser;
let company: string;
let operator: string;
let costly: string;

beforeAll(async () => {
  browser = await launchBrowser();
  const c = await ownCompany('Brookfell');
  company = c.id;
  operator = await staffOf(c, 'operator');
  // Eight homes over the last five days that have ended: cost per 100 L of 10…16 p and one at 40 p,
  // DHW COP 2.6…3.2 and one at 1.0 (the fence arithmetic is in tests/integration/energy/fleet.test.ts).
  const days = Array.from({ length: 5 }, (_, i) => dateOf(Date.now() - (i + 1) * DAY_MS));
  const cost = [10, 11, 12, 13, 14, 15, 16, 40];
  const cop = [2.6, 2.7, 2.8, 2.9, 3.0, 3.1, 3.2, 1.0];
  for (let i = 0; i < 8; i++) {
    const id = await homeWithDays(
      c.id,
      i + 1,
      days.map((date) => ({ date, litres: 100, cost: cost[i]!, hpElec: 1, hpHeat: cop[i]! })),
    );
    if (i === 7) costly = id;
  }
}, 60_000);
afterAll(async () => {
  await browser?.close();
  await dropCompany(company);
  await closeTestDb();
});

describe('fleet energy in Chromium', () => {
  it('shows the averages and the outliers, and an outlier opens its tank', async () => {
    const page = await (await signedInContext(browser, operator)).newPage();
    await page.goto(`${baseUrl()}/fleet/energy`);
    await waitForIslands(page);
    const averages = page.getByRole('region', { name: 'Fleet averages' });
    await averages.waitFor({ timeout: 20_000 });
    // 5 days × 131 p over 40 home-days = 16.4 p a home a day; 655 p over 4,000 L = 16.4 p per 100 L.
    await expect(averages.textContent()).resolves.toMatch(/Homes8/);
    await expect(averages.textContent()).resolves.toMatch(/Cost a home a day16p/);
    await expect(averages.textContent()).resolves.toMatch(/Cost per 100 L warm water16\.4p/);
    const costTable = page.getByRole('table', { name: /cost per 100 litres/i });
    await expect(costTable.locator('tbody tr').count()).resolves.toBe(1);
    await expect(costTable.locator('tbody tr').first().textContent()).resolves.toMatch(/40\.0p.*high \(worse\)/);
    const copTable = page.getByRole('table', { name: /dhw cop/i });
    await expect(copTable.locator('tbody tr').first().textContent()).resolves.toMatch(/1\.00.*low \(worse\)/);
    await screenshot(page, 'energy-fleet');
    await page.getByRole('button', { name: 'Last 7 days' }).click();
    await expect(page.getByRole('button', { name: 'Last 7 days' }).getAttribute('aria-pressed')).resolves.toBe('true');
    await costTable.locator('tbody tr a').first().click();
    await page.waitForURL(`**/tanks/${costly}`);
  }, 90_000);
});
