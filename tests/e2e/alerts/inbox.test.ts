// The staff inbox in Debian's Chromium: alerts raised by the rules on an accelerated fleet are
// listed most severe first with their evidence, filtered by kind, and acknowledged in bulk.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { launchBrowser, baseUrl, screenshot, waitForIslands } from '../../support/browser';
import { signIn } from '../../support/session';
import { query } from '../../support/db';
import { signedInContext } from '../views/helpers';
import {
  AcceleratedFleet,
  HOUR,
  addTank,
  createCompany,
  dropCompany,
  openKinds,
  startDaysAgo,
  type AlertCompany,
  type SimTankRow,
} from '../../integration/alerts/harness';

let browser: Browser;
let company: AlertCompany;
let tanks: SimTankRow[];

beforeAll(async () => {
  company = await createCompany();
  tanks = [
    await addTank(company, 18, ['sensor_open']),
    await addTank(company, 27, ['short_cycle']),
    await addTank(company, 3, ['sensors_swapped']),
    await addTank(company, 15),
  ];
  const start = startDaysAgo(12);
  const fleet = new AcceleratedFleet(company, tanks, start);
  await fleet.run(
    start + 12 * HOUR,
    async () => (await openKinds(tanks[1]!.id)).length > 0 && (await openKinds(tanks[2]!.id)).length > 0,
  );
  browser = await launchBrowser();
}, 180_000);
afterAll(async () => {
  await browser?.close();
  await dropCompany(company);
}, 60_000);

describe('the alert inbox', () => {
  it('lists open alerts with their evidence, filters by kind and acknowledges in bulk', async () => {
    const cookie = await signIn(baseUrl(), company.operator.email, 'alerts-test-password');
    const context = await signedInContext(browser, cookie);
    const page = await context.newPage();
    await page.goto(`${baseUrl()}/alerts`);
    await waitForIslands(page);
    const list = page.getByRole('list', { name: 'Alerts' });
    await list.waitFor();
    await expect.poll(() => list.getByRole('listitem').count()).toBe(3);
    expect(await page.getByRole('link', { name: 'Alerts' }).getAttribute('aria-current')).toBe('page');
    await expect.poll(() => page.getByText(/Sensor 3 \(from the bottom\) gives no reading/).count()).toBe(1);
    expect(await page.getByRole('link', { name: tanks[0]!.serial }).getAttribute('href')).toMatch(
      new RegExp(`^/tanks/${tanks[0]!.id}\\?from=`),
    );
    await screenshot(page, 'alerts-inbox');

    await page.getByLabel('Kind').selectOption('sensor_fault');
    await expect.poll(() => list.getByRole('listitem').count()).toBe(2);
    expect(page.url()).toContain('kind=sensor_fault');
    await page.getByLabel('Select all open on this page').check();
    await page.getByLabel('Note (optional)').fill('Engineer visit booked');
    await page.getByRole('button', { name: /Acknowledge 2/ }).click();
    await expect
      .poll(
        async () =>
          (
            await query<{ n: number }>(
              `select count(*)::int as n from alerts where company_id = $1 and state = 'acknowledged' and note = 'Engineer visit booked'`,
              [company.id],
            )
          )[0]!.n,
      )
      .toBe(2);
    await expect.poll(() => page.getByText('Acknowledged by Test operator', { exact: false }).count()).toBe(2);
    await screenshot(page, 'alerts-inbox-acknowledged');
    const [{ n }] = await query<{ n: number }>(
      `select count(*)::int as n from alerts where company_id = $1 and kind = 'short_cycling' and state = 'open'`,
      [company.id],
    );
    expect(n).toBe(1);
    await context.close();
  }, 90_000);

  it('shows an admin the thresholds with their defaults and sources, and names a bad field', async () => {
    const [adminUser] = await query<{ id: string }>(`select id from "user" where id = $1`, [company.operator.id]);
    await query(`update memberships set role = 'admin' where user_id = $1 and company_id = $2`, [
      adminUser!.id,
      company.id,
    ]);
    const cookie = await signIn(baseUrl(), company.operator.email, 'alerts-test-password');
    const context = await signedInContext(browser, cookie);
    const page = await context.newPage();
    await page.goto(`${baseUrl()}/admin/alert-settings`);
    await waitForIslands(page);
    await expect.poll(() => page.getByText(/HSE HSG274 Part 2 \(2014\)/).count()).toBeGreaterThan(0);
    await page.getByLabel('Shortest gap between compressor starts (min)').fill('2');
    await page.getByRole('button', { name: 'Save thresholds' }).click();
    await expect.poll(() => page.getByText(/must be at least 5 minutes/).count()).toBe(1);
    await page.getByLabel('Shortest gap between compressor starts (min)').fill('45');
    await page.getByRole('button', { name: 'Save thresholds' }).click();
    await expect.poll(() => page.getByText(/Saved\./).count()).toBe(1);
    const [t] = await query<{ settings: any }>(`select settings from alert_thresholds where company_id = $1`, [
      company.id,
    ]);
    expect(t!.settings.shortCycleMinGapMin).toBe(45);
    await screenshot(page, 'alerts-thresholds');
    await context.close();
  }, 60_000);
});
