// The cold water supply page in Chromium: an engineer sets the measured cold inlet by keyboard, a
// value that is no cold supply is refused beside its field, and the tank page then counts from it;
// an operator sees the value but cannot change it.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { baseUrl, launchBrowser, screenshot, waitForIslands } from '../../support/browser';
import { closeTestDb, query } from '../../support/db';
import { signInAs } from '../../support/session';
import { dropTanks, makeTank, setLatest, type EnergyTank } from '../../integration/energy/fixtures';
import { signedInContext } from './helpers';

let browser: Browser;
let tank: EnergyTank;

beforeAll(async () => {
  browser = await launchBrowser();
  tank = await makeTank('kestrel-vale');
  await setLatest(tank, [20, 40, 52, 55]);
}, 60_000);
afterAll(async () => {
  await browser?.close();
  await dropTanks();
  await closeTestDb();
});

describe('a home’s cold water supply in Chromium', () => {
  it('lets an engineer set it, refuses a hot value by the field, and the tank page counts from it', async () => {
    const page = await (await signedInContext(browser, await signInAs(baseUrl(), 'engineer'))).newPage();
    await page.goto(`${baseUrl()}/homes/${tank.homeId}/cold-water`);
    await waitForIslands(page);
    await page.getByText('EN 16147’s standard 10 °C').waitFor();
    const field = page.getByLabel('Measured at the cold inlet, °C');
    await field.focus();
    await page.keyboard.type('45');
    await page.keyboard.press('Enter');
    const error = page.locator('#f-coldInletC-error');
    await error.waitFor();
    await expect(error.textContent()).resolves.toMatch(/at most 25/);
    await expect(field.getAttribute('aria-invalid')).resolves.toBe('true');
    expect(
      (await query<{ c: number | null }>('select cold_inlet_c as c from homes where id = $1', [tank.homeId]))[0]!.c,
    ).toBeNull();
    await field.fill('14');
    await page.getByRole('button', { name: 'Save' }).click();
    await page.getByText('Saved.').waitFor();
    await page.getByText('(measured at this home)').waitFor();
    await screenshot(page, 'cold-water-engineer');
    expect(
      (await query<{ c: number | null }>('select cold_inlet_c as c from homes where id = $1', [tank.homeId]))[0]!.c,
    ).toBe(14);
    const api = await page.request.get(`${baseUrl()}/api/tanks/${tank.id}`);
    expect((await api.json()).figures.coldC).toBe(14);
  });

  it('shows an operator the value without a form', async () => {
    const page = await (await signedInContext(browser, await signInAs(baseUrl(), 'operator'))).newPage();
    await page.goto(`${baseUrl()}/homes/${tank.homeId}/cold-water`);
    await waitForIslands(page);
    await page.getByText('An administrator or engineer can change it.').waitFor();
    await expect(page.getByLabel('Measured at the cold inlet, °C').count()).resolves.toBe(0);
  });
});
