import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { createAccount } from '../../support/accounts';
import { baseUrl, launchBrowser, screenshot, waitForIslands } from '../../support/browser';
import { closeTestDb, query } from '../../support/db';
import { signIn, signInAs } from '../../support/session';
import { localDayBounds } from '../../../src/lib/energy';
import {
  dropTanks,
  makeTank,
  setHomeTariff,
  setLatest,
  writeHandWorkedDay,
  type EnergyTank,
} from '../../integration/energy/fixtures';
import { signedInContext } from '../views/helpers';

let browser: Browser;
let tank: EnergyTank;
let householder: string;

beforeAll(async () => {
  browser = await launchBrowser();
  tank = await makeTank('kestrel-vale', { declaredLossW: 45 });
  const day = new Date(Date.now() - 86_400_000).toISOString().slice(0, 10);
  // The hand-worked day of tests/integration/energy/energy.test.ts: 1 kWh at 10 p + 1.5 kWh at 30 p = 55 p.
  await setHomeTariff(tank, {
    kind: 'day_night',
    timeZone: 'Europe/London',
    nightStartMin: 30,
    nightEndMin: 330,
    dayImportPence: 30,
    nightImportPence: 10,
    exportPence: 0,
    validFromMs: localDayBounds(day, 'Europe/London').startMs - 86_400_000,
    validToMs: null,
  });
  await writeHandWorkedDay(tank, day);
  await setLatest(tank, [40, 50, 53, 55]);
  const own = await createAccount({
    company: 'kestrel-vale',
    role: 'householder',
    homeId: tank.homeId,
    label: 'energy-e2e',
  });
  householder = await signIn(baseUrl(), own.email, own.password);
}, 60_000);
afterAll(async () => {
  await browser?.close();
  await query('delete from commands where tank_id = $1', [tank.id]);
  await query('delete from tariffs where home_id = $1', [tank.homeId]);
  await dropTanks();
  await closeTestDb();
});

describe('energy and planning in Chromium', () => {
  it('shows an engineer the day’s energy and cost, and a charge plan chart', async () => {
    const page = await (await signedInContext(browser, await signInAs(baseUrl(), 'engineer'))).newPage();
    await page.goto(`${baseUrl()}/tanks/${tank.id}`);
    await waitForIslands(page);
    const table = page.locator('section', { has: page.getByRole('heading', { name: 'Energy and cost, last 7 days' }) });
    await table.locator('tbody tr').first().waitFor();
    await expect(table.locator('tbody tr').first().textContent()).resolves.toContain('55p');
    await page.getByRole('button', { name: 'Work out a plan' }).click();
    await page.getByTestId('plan-summary').waitFor({ timeout: 30_000 });
    await expect(page.getByTestId('plan-summary').textContent()).resolves.toMatch(/fixed thermostat/);
    await expect(
      page
        .locator('section', { has: page.getByRole('heading', { name: 'Charge plan' }) })
        .locator('canvas')
        .count(),
    ).resolves.toBeGreaterThan(0);
    await screenshot(page, 'energy-tank-plan');
  }, 90_000);

  it('tells the householder what their hot water cost, and sends the cheap plan', async () => {
    const page = await (await signedInContext(browser, householder, { width: 390, height: 844 })).newPage();
    await page.goto(`${baseUrl()}/home`);
    await waitForIslands(page);
    const card = page.getByTestId('hot-water-cost');
    await card.getByText('55p', { exact: true }).waitFor({ timeout: 20_000 });
    await page.getByRole('button', { name: 'Work out a plan' }).click();
    await page.getByTestId('plan-summary').waitFor({ timeout: 30_000 });
    await page.getByRole('button', { name: 'Use this plan' }).click();
    await page.getByText(/^Sent\./).waitFor({ timeout: 20_000 });
    const [row] = await query<{ kind: string }>(
      'select kind from commands where tank_id = $1 order by created_at desc limit 1',
      [tank.id],
    );
    expect(row?.kind).toBe('set_schedule');
    await screenshot(page, 'energy-home-cost');
  }, 90_000);
});

describe('tariffs page in Chromium', () => {
  it('lists the company defaults, refuses a CSV line by line and adds a tariff', async () => {
    // Orrin Bay starts with no default tariffs, so Kestrel Vale's plans and costs are left alone.
    const page = await (await signedInContext(browser, await signInAs(baseUrl(), 'admin', 'orrin-bay'))).newPage();
    await page.goto(`${baseUrl()}/admin/tariffs`);
    await waitForIslands(page);
    await page
      .getByText(/None yet|Orrin e2e default/)
      .first()
      .waitFor();
    await page.getByLabel('Prices file').setInputFiles({
      name: 'prices.csv',
      mimeType: 'text/csv',
      buffer: Buffer.from(
        'start,end,import,export,unit\n2030-01-01T00:00:00Z,2030-01-01T00:30:00Z,14,4,p/kWh\n2030-01-01T01:00:00Z,2030-01-01T01:30:00Z,14,4,p/kWh\n',
      ),
    });
    await page.getByRole('button', { name: 'Upload' }).click();
    await page.getByText(/no prices from 2030-01-01T00:30:00Z to 2030-01-01T01:00:00Z/).waitFor();
    await expect(page.getByText('line 3: start').count()).resolves.toBe(1);
    await page.getByLabel('Kind').selectOption('flat');
    await page.getByLabel('Name').fill('Orrin e2e default');
    await page.getByLabel('First day').fill('2030-01-01');
    await page.getByRole('button', { name: 'Add tariff' }).click();
    await page.getByRole('status').getByText('Tariff added.').waitFor();
    await page.getByText('Orrin e2e default').waitFor();
    await screenshot(page, 'energy-admin-tariffs');
    await query(`delete from tariffs where name = 'Orrin e2e default'`);
  }, 90_000);
});
