// In Chromium: an engineer sees solar surplus used on the tank page and sets the home's own tariff
// with the form (field errors first, then a good one); the householder reads the free solar heat in
// plain words on their phone.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { createAccount } from '../../support/accounts';
import { baseUrl, launchBrowser, screenshot, waitForIslands } from '../../support/browser';
import { closeTestDb, query } from '../../support/db';
import { signIn, signInAs } from '../../support/session';
import { localDayBounds } from '../../../src/lib/energy';
import {
  addSolarHour,
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
const ownTariffs = async () =>
  query<{
    name: string | null;
    kind: string;
    valid_from: Date;
    valid_to: Date | null;
    prices: { importPence: number };
  }>('select name, kind, valid_from, valid_to, prices from tariffs where home_id = $1 order by created_at', [
    tank.homeId,
  ]);

beforeAll(async () => {
  browser = await launchBrowser();
  tank = await makeTank('kestrel-vale', { declaredLossW: 45 });
  const day = new Date(Date.now() - 86_400_000).toISOString().slice(0, 10);
  await writeHandWorkedDay(tank, day);
  await addSolarHour(tank, day);
  await setLatest(tank, [40, 50, 53, 55]);
  // Priced at first by a home tariff stored directly (day/night, 10 p at night, 30 p by day).
  await setHomeTariff(tank, {
    kind: 'day_night',
    timeZone: 'Europe/London',
    nightStartMin: 30,
    nightEndMin: 330,
    dayImportPence: 30,
    nightImportPence: 10,
    exportPence: 15,
    validFromMs: localDayBounds(day, 'Europe/London').startMs - 86_400_000,
    validToMs: null,
  });
  const own = await createAccount({
    company: 'kestrel-vale',
    role: 'householder',
    homeId: tank.homeId,
    label: 'home-tariff-e2e',
  });
  householder = await signIn(baseUrl(), own.email, own.password);
}, 60_000);
afterAll(async () => {
  await browser?.close();
  await query('delete from tariffs where home_id = $1', [tank.homeId]);
  await dropTanks();
  await closeTestDb();
});

describe('a home’s tariff and its solar heat in Chromium', () => {
  it('shows the engineer the solar surplus used, then sets the home’s tariff through the form', async () => {
    const page = await (await signedInContext(browser, await signInAs(baseUrl(), 'engineer'))).newPage();
    await page.goto(`${baseUrl()}/tanks/${tank.id}`);
    await waitForIslands(page);
    // 1.5 kWh of the element's heat came from surplus (the fixture's arithmetic).
    await page.getByTestId('solar-used').getByText('1.50 kWh').waitFor({ timeout: 20_000 });
    await page.getByRole('columnheader', { name: 'Immersion (solar) kWh' }).waitFor();
    await page.getByTestId('solar-used').scrollIntoViewIfNeeded();
    await screenshot(page, 'energy-tank-solar');

    await page.getByRole('link', { name: 'Set this home’s tariff' }).click();
    await page.waitForURL(`**/homes/${tank.homeId}/tariff`);
    await waitForIslands(page);
    await page.getByTestId('home-tariff-list').waitFor();

    // Bad input first: a blank night price, a night time that is not a clock time, a price in the wrong unit.
    await page.getByLabel('Unit').selectOption('£/kWh');
    await page.getByLabel('Day import price').fill('27');
    await page.getByLabel('Night from').fill('25:00');
    await page.getByRole('button', { name: 'Save tariff for this home' }).click();
    await page.getByTestId('tariff-errors').waitFor();
    await expect(page.locator('[data-field-error="nightStart"]').textContent()).resolves.toMatch(/HH:MM/);
    await expect(page.locator('[data-field-error="nightImport"]').textContent()).resolves.toMatch(
      /^Must be given: the night import price/,
    );
    await expect(page.getByLabel('Night from').getAttribute('aria-invalid')).resolves.toBe('true');
    await screenshot(page, 'energy-home-tariff-errors');
    await page.getByLabel('Night from').fill('00:30');
    await page.getByLabel('Night import price').fill('0.09');
    await page.getByRole('button', { name: 'Save tariff for this home' }).click();
    // 27 £/kWh is 2,700 p/kWh: the shared schema refuses it naming the field (500 p/kWh limit, common practice).
    await expect(page.locator('[data-field-error="dayImport"]').textContent()).resolves.toMatch(/check the unit/);
    expect(await ownTariffs()).toHaveLength(1);

    // Then a good one, for a set period.
    await page.getByLabel('Day import price').fill('0.27');
    await page.getByLabel('Name').fill('Wendmoor Two Rate (e2e)');
    await page.getByLabel('Export price').fill('0.15');
    await page.getByLabel('First day').fill('2027-01-01');
    await page.getByLabel('Last day').fill('2027-06-30');
    await page.getByRole('button', { name: 'Save tariff for this home' }).click();
    await expect(page.getByTestId('tariff-saved').textContent()).resolves.toBe(
      'Saved: Wendmoor Two Rate (e2e) prices this home from 1 Jan 2027 to 30 Jun 2027.',
    );
    await page.getByTestId('home-tariff-list').getByText('Wendmoor Two Rate (e2e)').waitFor();
    await expect(page.getByTestId('tariff-errors').count()).resolves.toBe(0);
    const rows = await ownTariffs();
    expect(rows).toHaveLength(2);
    const saved = rows[1]!;
    expect(saved).toMatchObject({ name: 'Wendmoor Two Rate (e2e)', kind: 'day_night' });
    // £0.27/kWh is 27 p/kWh (100 p = £1); the period runs from midnight at the home on 1 January (GMT) to
    // midnight after 30 June (BST, an hour ahead of UTC).
    expect(saved.prices.importPence).toBeUndefined();
    expect((saved.prices as unknown as { dayImportPence: number }).dayImportPence).toBeCloseTo(27, 9);
    expect(saved.valid_from.toISOString()).toBe('2027-01-01T00:00:00.000Z');
    expect(saved.valid_to?.toISOString()).toBe('2027-06-30T23:00:00.000Z');
    await screenshot(page, 'energy-home-tariff-saved');
  }, 90_000);

  it('tells the householder, in plain words on a phone, what their solar panels heated', async () => {
    const page = await (await signedInContext(browser, householder, { width: 390, height: 844 })).newPage();
    await page.goto(`${baseUrl()}/home`);
    await waitForIslands(page);
    const sentence = page.getByTestId('solar-sentence');
    await sentence.waitFor({ timeout: 20_000 });
    // 1.5 kWh ÷ (0.9902 kg × 4.180 kJ/(kg·K) × 30 K ≈ 0.0345 kWh per litre at 40 °C from 10 °C mains; IAPWS-IF97 water at 45 °C) ≈ 43.5 litres.
    await expect(sentence.textContent()).resolves.toMatch(
      /^Your solar panels heated about 4[2-4] litres of it for free over the last (day|\d+ days), with spare power/,
    );
    await sentence.scrollIntoViewIfNeeded();
    await screenshot(page, 'energy-home-solar');
  }, 90_000);
});
