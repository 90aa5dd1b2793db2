// On the demo as seeded, the desk's Commissioning and Service pages list entries, and a demo
// tank's signed record shows its photos, in Chromium.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { baseUrl, launchBrowser, screenshot } from '../../support/browser';
import { signInAs } from '../../support/session';
import { demoTanks } from '../../../src/lib/demo/scenario';

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

const kestrel = demoTanks().filter((t) => t.companySlug === 'kestrel-vale');

describe('the lived-in demo in Chromium', () => {
  it('lists signed records on the Commissioning page and overdue and due inspections on the Service page', async () => {
    const cookie = await signInAs(baseUrl(), 'operator', 'kestrel-vale');
    const ctx = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    await ctx.addCookies(
      cookie.split('; ').map((pair) => {
        const i = pair.indexOf('=');
        return { name: pair.slice(0, i), value: pair.slice(i + 1), url: baseUrl() };
      }),
    );
    const page = await ctx.newPage();

    await page.goto(`${baseUrl()}/commissioning`);
    const signed = page.locator('section', { hasText: 'Signed records' }).locator('tbody tr');
    const demoSigned = kestrel.filter((t) => t.commissioning).map((t) => t.serial);
    const listed = await signed.locator('td:first-child a').allTextContents();
    // The page lists the latest 200 records of every state; other tests in a full run add records of
    // their own to this company, so the check asks for the demo's signed records to fill most of it.
    expect(demoSigned.length).toBeGreaterThan(150);
    expect(listed.filter((s) => demoSigned.includes(s.trim())).length).toBeGreaterThanOrEqual(100);
    await screenshot(page, 'demo-commissioning');

    // A demo record: its sections, its PDF link and its photos, loaded.
    await signed.locator('td:first-child a', { hasText: demoSigned[1]! }).first().click();
    await page.getByRole('heading', { name: `Commissioning record · ${demoSigned[1]}` }).waitFor();
    await expect(page.getByRole('link', { name: 'Record (PDF)' }).count()).resolves.toBe(1);
    const photos = page.locator('section', { hasText: 'Photos and documents' }).locator('img');
    expect(await photos.count()).toBeGreaterThanOrEqual(1);
    await page.waitForFunction(() =>
      [...document.querySelectorAll('section img')].every(
        (i) => (i as HTMLImageElement).complete && (i as HTMLImageElement).naturalWidth > 0,
      ),
    );
    await screenshot(page, 'demo-commissioning-record');

    await page.goto(`${baseUrl()}/service`);
    const overdue = kestrel.filter((t) => t.inspectionMissed).map((t) => t.serial);
    for (const serial of overdue)
      await expect(page.locator(`[data-due="${serial}"]`).getAttribute('data-state')).resolves.toBe('overdue');
    expect(await page.locator('[data-state="due_soon"]').count()).toBeGreaterThan(0);
    await screenshot(page, 'demo-service');

    // An overdue tank's history: its commissioning, its annual inspections, and the inspection it missed shown as overdue.
    const late = kestrel.find((t) => t.inspectionMissed && t.commissioning && t.inspectionsDaysAgo.length > 0)!;
    await page.locator(`[data-due="${late.serial}"]`).getByRole('link', { name: late.serial }).click();
    await page.getByRole('heading', { name: late.serial }).waitFor();
    await expect(page.locator('[data-history="visit"]').count()).resolves.toBe(late.inspectionsDaysAgo.length);
    await expect(page.locator('[data-history="commissioned"]').count()).resolves.toBe(1);
    await expect(page.locator('[data-next-due]').locator('xpath=..').textContent()).resolves.toContain('(Overdue)');
    await screenshot(page, 'demo-service-history');
    await ctx.close();
  }, 60_000);
});
