// Alert links carry ?from=&to= (six hours either side of the evidence): the tank page opens on that
// range, keeps it in the address, and says so when a link's range cannot be used.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { baseUrl, launchBrowser, screenshot, waitForIslands } from '../../support/browser';
import { closeTestDb, query } from '../../support/db';
import { companyId } from '../../support/accounts';
import { signInAs } from '../../support/session';
import { createFixture, dropFixture, type Fixture } from '../../integration/views/fixtures';
import { signedInContext } from './helpers';

let browser: Browser;
let fx: Fixture;
let at: number;
const HOUR = 3_600_000;
/** datetime-local value of an instant in UTC (the browser context runs in UTC). */
const localInput = (ms: number) => new Date(ms).toISOString().slice(0, 16);

beforeAll(async () => {
  [browser, fx] = await Promise.all([launchBrowser(), createFixture('kestrel-vale', 'Ashby Wend')]);
  // An alert on the tank with two days of readings, its evidence 18 h back: the link spans 24 h to 12 h ago.
  at = fx.now.getTime() - 18 * HOUR;
  await query(
    `insert into alerts (company_id, tank_id, kind, severity, state, evidence, opened_at) values ($1, $2, 'low_hot_water', 'warning', 'open', $3, $4)`,
    [
      await companyId('kestrel-vale'),
      fx.healthy.id,
      JSON.stringify({
        summary: 'About 40 L of hot water at 40 °C is stored, but the home usually uses about 120 L in the next 3 h.',
        facts: {},
        at,
      }),
      new Date(at),
    ],
  );
});
afterAll(async () => {
  await browser?.close();
  if (fx) await dropFixture(fx);
  await closeTestDb();
});

async function readingsRange(page: Page, action: () => Promise<unknown>): Promise<{ from: string; to: string }> {
  const [res] = await Promise.all([
    page.waitForResponse((r) => r.url().includes(`/api/tanks/${fx.healthy.id}/readings?`) && r.status() === 200),
    action(),
  ]);
  const u = new URL(res.url());
  return { from: u.searchParams.get('from')!, to: u.searchParams.get('to')! };
}

describe('a tank opened from an alert link', () => {
  it('shows the range the link gives, from the inbox and from the tank page itself', async () => {
    const context = await signedInContext(browser, await signInAs(baseUrl(), 'operator'));
    const page = await context.newPage();
    await page.goto(`${baseUrl()}/alerts?kind=low_hot_water`);
    await waitForIslands(page);
    const link = page.getByRole('link', { name: fx.healthy.serial });
    await link.waitFor();
    const from = new Date(at - 6 * HOUR).toISOString();
    const to = new Date(at + 6 * HOUR).toISOString();
    expect(await link.getAttribute('href')).toBe(`/tanks/${fx.healthy.id}?from=${from}&to=${to}`);

    const asked = await readingsRange(page, async () => {
      await link.click();
      await page.waitForURL(`**/tanks/${fx.healthy.id}?from=*`);
    });
    expect(asked).toEqual({ from, to });
    await waitForIslands(page);
    await page.getByText('720 points, every reading').waitFor();
    expect(await page.getByRole('radio', { name: 'Custom' }).getAttribute('aria-checked')).toBe('true');
    expect(await page.getByLabel('From', { exact: true }).inputValue()).toBe(localInput(at - 6 * HOUR));
    expect(await page.getByLabel('To', { exact: true }).inputValue()).toBe(localInput(at + 6 * HOUR));
    await expect(page.getByTestId('range-shown').textContent()).resolves.toMatch(/^From .+ to .+$/);
    // The oldest point shown is the link's start (one reading a minute in the fixture).
    await page.getByLabel('Move through time (arrow keys)').focus();
    await page.keyboard.press('Home');
    await expect(page.getByTestId('readout-time').textContent()).resolves.toContain(
      localInput(at - 6 * HOUR).slice(11),
    );
    // The tank page lists the same alert, and can show its evidence's time again after a change of range.
    await expect(page.getByText(/About 40 L of hot water at 40 °C is stored/).count()).resolves.toBe(1);
    await screenshot(page, 'views-tank-from-alert-link');

    await readingsRange(page, () => page.getByRole('radio', { name: '7 days' }).click());
    await page.getByText('15-minute means').first().waitFor();
    expect(new URL(page.url()).search).toBe('');
    // (The readings of that range may come from the page's cache: no request to wait for.)
    await page.locator('[data-alert-kind="low_hot_water"]').getByRole('button', { name: 'Show on the charts' }).click();
    await page.getByText('720 points, every reading').waitFor();
    expect(Object.fromEntries(new URL(page.url()).searchParams)).toEqual({ from, to });
    expect(await page.getByLabel('From', { exact: true }).inputValue()).toBe(localInput(at - 6 * HOUR));

    // A reload keeps the range (it is in the address).
    await page.reload();
    await waitForIslands(page);
    await page.getByText('720 points, every reading').waitFor();

    // A range that ends before it starts is refused beside its field, and the range shown stays.
    await page.getByLabel('To', { exact: true }).fill(localInput(at - 7 * HOUR));
    await page.getByRole('button', { name: 'Show', exact: true }).click();
    await expect(page.locator('#f-range-to-error').textContent()).resolves.toBe('The end must be after the start.');
    expect(await page.getByLabel('To', { exact: true }).getAttribute('aria-invalid')).toBe('true');
    expect(Object.fromEntries(new URL(page.url()).searchParams)).toEqual({ from, to });
    await page.getByText('720 points, every reading').waitFor();
    await screenshot(page, 'views-tank-range-refused');
    await context.close();
  });

  it('falls back to the last 24 hours and says why when the link range cannot be used', async () => {
    const context = await signedInContext(browser, await signInAs(baseUrl(), 'engineer'));
    const page = await context.newPage();
    for (const [qs, why] of [
      [`from=last-tuesday&to=${fx.now.toISOString()}`, /from must be an ISO 8601 date-time with a time zone/],
      [`from=${fx.now.toISOString()}&to=${new Date(fx.now.getTime() - HOUR).toISOString()}`, /to must be after from/],
      [`from=${fx.now.toISOString()}`, /to is missing/],
    ] as const) {
      await page.goto(`${baseUrl()}/tanks/${fx.healthy.id}?${qs}`);
      await waitForIslands(page);
      const notice = page.getByRole('alert').filter({ hasText: 'Showing the last 24 hours instead.' });
      await notice.waitFor();
      await expect(notice.textContent()).resolves.toMatch(why);
      expect(await page.getByRole('radio', { name: '24 hours' }).getAttribute('aria-checked')).toBe('true');
      await page.getByText('every reading').first().waitFor();
    }
    await screenshot(page, 'views-tank-bad-link-range');
    await page.getByRole('button', { name: 'Dismiss' }).click();
    await expect(
      page.getByRole('alert').filter({ hasText: 'Showing the last 24 hours instead.' }).count(),
    ).resolves.toBe(0);
    await context.close();
  });
});
