import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { baseUrl, launchBrowser, screenshot, waitForIslands } from '../../support/browser';
import { closeTestDb } from '../../support/db';
import { signInAs } from '../../support/session';
import { createFixture, dropFixture, type Fixture } from '../../integration/views/fixtures';
import { signedInContext } from './helpers';

let browser: Browser;
let fx: Fixture;
beforeAll(async () => {
  [browser, fx] = await Promise.all([launchBrowser(), createFixture('kestrel-vale', 'Cobbmere')]);
});
afterAll(async () => {
  await browser?.close();
  if (fx) await dropFixture(fx);
  await closeTestDb();
});

describe('service desk in Chromium', () => {
  it('finds the tank with a sensor fault and opens it', async () => {
    const context = await signedInContext(browser, await signInAs(baseUrl(), 'operator'));
    const page = await context.newPage();
    await page.goto(`${baseUrl()}/fleet`);
    await waitForIslands(page);
    await page.getByRole('heading', { name: 'Deal with these first' }).waitFor();
    await page.getByLabel('Search', { exact: true }).fill(fx.prefix);
    await page.getByLabel('Problem', { exact: true }).selectOption('sensor_fault');
    const row = page.locator('tbody tr', { hasText: fx.faulty.serial });
    await row.waitFor({ timeout: 20_000 });
    await expect.poll(() => page.locator('tbody tr').count(), { timeout: 20_000 }).toBe(1);
    await expect(row.textContent()).resolves.toContain('Sensor fault');
    await screenshot(page, 'views-fleet-filtered');
    await page.getByLabel('Problem', { exact: true }).selectOption('');
    await page.getByLabel('Search', { exact: true }).fill('');
    await expect.poll(() => page.locator('tbody tr').count(), { timeout: 20_000 }).toBe(25);
    await screenshot(page, 'views-fleet');
    await page.getByLabel('Search', { exact: true }).fill(fx.prefix);
    await page.getByLabel('Problem', { exact: true }).selectOption('sensor_fault');
    await row.waitFor();
    await row.getByRole('link', { name: fx.faulty.serial }).click();
    await page.waitForURL(`**/tanks/${fx.faulty.id}`);
    await waitForIslands(page);
    await page.getByRole('heading', { level: 1, name: fx.faulty.serial }).waitFor();
    // The tank page shows the same open alert as the list, with the rule's evidence.
    await expect(page.getByText(/^Sensor 2 \(from the bottom\) gives no reading since /).count()).resolves.toBe(1);
    await screenshot(page, 'views-tank-faulty');
    await context.close();
  });

  it('remembers the columns chosen', async () => {
    const context = await signedInContext(browser, await signInAs(baseUrl(), 'admin'));
    const page = await context.newPage();
    await page.goto(`${baseUrl()}/fleet`);
    await waitForIslands(page);
    await page.getByRole('button', { name: 'Columns' }).click();
    await page.getByLabel('Town', { exact: true }).first().waitFor();
    await page.locator('#col-town').uncheck();
    await page.getByRole('button', { name: 'Move V40 earlier' }).click();
    await page.reload();
    await waitForIslands(page);
    await page.locator('thead th').first().waitFor();
    const heads = await page.locator('thead th').allTextContents();
    expect(heads.map((h) => h.replace(/[▲▼↕]/g, '').trim())).toEqual([
      'Serial',
      'Needs',
      'Home',
      'V40',
      'State of charge',
      'Top',
      'Last reading',
      'Heat source',
    ]);
    await context.close();
  });
});
