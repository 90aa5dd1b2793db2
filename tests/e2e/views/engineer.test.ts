import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { baseUrl, launchBrowser, screenshot, waitForIslands } from '../../support/browser';
import { closeTestDb, query } from '../../support/db';
import { signInAs } from '../../support/session';
import { createFixture, dropFixture, type Fixture } from '../../integration/views/fixtures';
import { signedInContext } from './helpers';

let browser: Browser;
let fx: Fixture;
beforeAll(async () => {
  [browser, fx] = await Promise.all([launchBrowser(), createFixture()]);
});
afterAll(async () => {
  await browser?.close();
  if (fx) await dropFixture(fx);
  await closeTestDb();
});

const sensorValue = (page: import('playwright-core').Page, layer: number) =>
  page.locator(`[data-testid="layer-readout"] li[data-layer="${layer}"] .figure`).textContent();

describe('field engineer in Chromium', () => {
  it('changes the heatmap range and reads a layer value', async () => {
    const context = await signedInContext(browser, await signInAs(baseUrl(), 'engineer'));
    const page = await context.newPage();
    await page.goto(`${baseUrl()}/tanks/${fx.healthy.id}`);
    await waitForIslands(page);
    await page.getByText('every reading').first().waitFor();
    // 24 hours of raw readings: the slider starts at the newest; Home jumps to the oldest.
    await page.getByLabel('Move through time (arrow keys)').focus();
    await page.keyboard.press('Home');
    // Sensor 1 is 15 °C in every fixture reading; sensor 2 is 30 °C plus 0.1 K per minute past the hour.
    await expect(sensorValue(page, 1)).resolves.toBe('15.0 °C');
    await page.keyboard.press('ArrowRight');
    const time = await page.getByTestId('readout-time').textContent();
    const minute = Number(time!.slice(-2));
    await expect(sensorValue(page, 2)).resolves.toBe(`${(30 + minute / 10).toFixed(1)} °C`);
    await screenshot(page, 'views-tank-24h');

    await page.getByRole('radio', { name: '7 days' }).click();
    await page.getByText('15-minute means').first().waitFor();
    await page.getByLabel('Move through time (arrow keys)').focus();
    await page.keyboard.press('End');
    // The fixture's 15-minute means: 16, 31, 49 and 61.5 °C bottom to top.
    await expect(sensorValue(page, 4)).resolves.toBe('61.5 °C');
    await expect(sensorValue(page, 1)).resolves.toBe('16.0 °C');
    // Moving the mouse over the heatmap moves the readout too.
    const before = await page.getByTestId('readout-time').textContent();
    const canvas = page.locator('.uplot').first().locator('.u-over');
    const box = (await canvas.boundingBox())!;
    await page.mouse.move(box.x + box.width * 0.3, box.y + box.height / 2);
    await expect.poll(() => page.getByTestId('readout-time').textContent()).not.toBe(before);
    await screenshot(page, 'views-tank-7d');

    await page.setViewportSize({ width: 640, height: 900 });
    await screenshot(page, 'views-tank-narrow');
    await context.close();
  });

  it('polls only what is new since its newest point and adds it to the window', async () => {
    const context = await signedInContext(browser, await signInAs(baseUrl(), 'engineer'));
    const page = await context.newPage();
    const full: string[] = [];
    const polls: string[] = [];
    page.on('request', (r) => {
      if (r.url().includes(`/api/tanks/${fx.healthy.id}/readings`))
        (r.url().includes('since=') ? polls : full).push(r.url());
    });
    await page.goto(`${baseUrl()}/tanks/${fx.healthy.id}`);
    await waitForIslands(page);
    // The 6-hour window's first fetch (in full) must be in before the new reading is written.
    await page.getByText('every reading').first().waitFor();
    const sixHours = (url: string) => {
      const q = new URL(url).searchParams;
      return !q.has('since') && Date.parse(q.get('to')!) - Date.parse(q.get('from')!) === 6 * 3_600_000;
    };
    await Promise.all([
      page.waitForResponse((r) => r.url().includes('/readings?') && sixHours(r.url()) && r.ok()),
      page.getByRole('radio', { name: '6 hours' }).click(),
    ]);
    await page.getByText('every reading').first().waitFor();
    await expect(sensorValue(page, 4)).resolves.toBe('55.0 °C');
    // A reading for the minute now, as the writer would store it: the next poll brings it in.
    await query(
      `insert into readings (tank_id, ts, layers_cc, compressor, immersion_w, draw_dlpm, flow_cc)
       values ($1, date_trunc('minute', now()), array[1500, 3000, 4800, 5600]::smallint[], false, 0, 0, 5800) on conflict do nothing`,
      [fx.healthy.id],
    );
    // The readout follows the newest point: the top sensor's 56 °C is the new reading's.
    await expect.poll(() => sensorValue(page, 4), { timeout: 25_000 }).toBe('56.0 °C');
    expect(polls.length).toBeGreaterThan(0);
    const poll = new URL(polls.at(-1)!);
    expect(poll.searchParams.get('resolution')).toBe('raw');
    expect(Date.parse(poll.searchParams.get('since')!)).toBeGreaterThan(Date.parse(poll.searchParams.get('from')!));
    expect(full.filter((u) => u.includes('from=')).length).toBeLessThanOrEqual(2);
    await context.close();
  });
});
