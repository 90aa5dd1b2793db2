import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, BrowserContext } from 'playwright-core';
import { baseUrl, launchBrowser, screenshot, waitForIslands } from '../../support/browser';
import { closeTestDb, query } from '../../support/db';
import { signInAs } from '../../support/session';
import { commissionOverHttp, installRow, installsHeader, jpegPhoto } from '../../support/commissioning';

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await closeTestDb();
});

async function contextAs(role: 'admin' | 'engineer'): Promise<BrowserContext> {
  const cookie = await signInAs(baseUrl(), role, 'kestrel-vale');
  const ctx = await browser.newContext({ viewport: { width: 1280, height: 900 } });
  await ctx.addCookies(
    cookie.split('; ').map((pair) => {
      const i = pair.indexOf('=');
      return { name: pair.slice(0, i), value: pair.slice(i + 1), url: baseUrl() };
    }),
  );
  return ctx;
}

describe('service desk and administration in Chromium', () => {
  it('imports existing installs from CSV: a file with bad rows shows each and imports nothing, a good one imports all', async () => {
    const ctx = await contextAs('admin');
    const page = await ctx.newPage();
    await page.goto(`${baseUrl()}/commissioning/import`);
    await waitForIslands(page);
    const good = [installRow(), installRow()];
    const serialsOf = (rows: string[]) => rows.map((r) => r.split(',')[7]);
    const stored = async (serials: string[]) =>
      (await query('select id from tanks where serial = any($1)', [serials])).length;

    await page.setInputFiles('#installs-csv', {
      name: 'mixed.csv',
      mimeType: 'text/csv',
      buffer: Buffer.from(
        [installsHeader, good[0], installRow({ volume_l: '-5' }), installRow({ heat_source: 'wood' })].join('\n'),
      ),
    });
    await page.locator('[data-preview]').waitFor();
    await expect(page.locator('[data-error-row]').count()).resolves.toBe(2);
    await expect(page.locator('[data-error-row="3"]').textContent()).resolves.toContain(
      'volume_l must be at least 30.',
    );
    await expect(page.locator('[data-error-row="4"]').textContent()).resolves.toContain('heat_source must be one of');
    expect(await page.getByRole('button', { name: /Import all/ }).count()).toBe(0);
    await screenshot(page, 'import-errors');
    expect(await stored(serialsOf(good))).toBe(0);

    await page.setInputFiles('#installs-csv', {
      name: 'good.csv',
      mimeType: 'text/csv',
      buffer: Buffer.from([installsHeader, ...good].join('\n')),
    });
    await page.getByRole('button', { name: 'Import all 2 installs' }).click();
    await page.getByText('Imported 2 installs.').waitFor();
    expect(await stored(serialsOf(good))).toBe(2);
    await screenshot(page, 'import-done');
    await ctx.close();
  });

  it('lists an overdue inspection and records the visit with a photo', async () => {
    const engineerCookie = await signInAs(baseUrl(), 'engineer', 'kestrel-vale');
    const c = await commissionOverHttp({ base: baseUrl(), cookie: engineerCookie });
    expect(c.signOff.status).toBe(200);
    // Commissioned 13 months ago: its annual inspection (common practice) is overdue.
    await query("update tanks set commissioned_at = now() - interval '13 months' where id = $1", [c.tankId]);
    await query("update commissionings set signed_at = now() - interval '13 months' where tank_id = $1", [c.tankId]);
    const [{ serial }] = await query<{ serial: string }>('select serial from tanks where id = $1', [c.tankId]);

    const [alert] = await query<{ id: string }>(
      `insert into alerts (company_id, tank_id, kind, severity, evidence, opened_at)
      select company_id, id, 'heat_loss', 'warning', $2::jsonb, now() - interval '3 days' from tanks where id = $1 returning id`,
      [c.tankId, JSON.stringify({ summary: 'Standing loss above the declared figure.', facts: {}, at: Date.now() })],
    );
    const ctx = await contextAs('engineer');
    const page = await ctx.newPage();
    await page.goto(`${baseUrl()}/service`);
    const row = page.locator(`[data-due="${serial}"]`);
    await expect(row.getAttribute('data-state')).resolves.toBe('overdue');
    await screenshot(page, 'service-due');

    await row.getByRole('link', { name: serial }).click();
    await waitForIslands(page);
    await page.fill('#f-findings', 'Annual inspection: relief valve operated and reseated, vessel pre-charge checked.');
    await page.fill('#f-parts', '1 x anode');
    await page.fill('#f-topC', '59');
    await page.fill('#f-inletPressureBar', '3.1');
    await page.check('#f-reliefValveTested');
    await page.check(`#f-alert-${alert.id}`);
    await page.setInputFiles('#upload-file', {
      name: 'tundish.jpg',
      mimeType: 'image/jpeg',
      buffer: await jpegPhoto(900, 700),
    });
    await page.locator('[data-upload]').waitFor();
    await page.getByRole('button', { name: 'Record the visit' }).click();
    await page.locator('[data-history="visit"]').waitFor();
    await expect(page.locator('[data-history="visit"]').textContent()).resolves.toContain('1 × anode');
    await expect(page.locator('[data-history="visit"] img').count()).resolves.toBe(1);
    await expect(page.locator('[data-history="visit"]').textContent()).resolves.toContain(
      'Alerts resolved: Heat loss above declared',
    );
    const [resolved] = await query<{ state: string }>('select state from alerts where id = $1', [alert.id]);
    expect(resolved.state).toBe('resolved');
    await screenshot(page, 'service-history');
    await page.goto(`${baseUrl()}/service`);
    expect(await page.locator(`[data-due="${serial}"]`).count()).toBe(0);
    await ctx.close();
  }, 60_000);
});
