import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { thermistorSettings } from '../../../src/lib/thermal/index';
import { baseUrl, launchBrowser, screenshot, waitForIslands } from '../../support/browser';
import { closeTestDb, query } from '../../support/db';
import { linkIn, waitForMail } from '../../support/mail';
import { signIn, signInAs } from '../../support/session';
import { call, jpegPhoto, pdfText, sendReading } from '../../support/commissioning';

let browser: Browser;
let context: BrowserContext;
let engineerCookie: string;
const tag = randomUUID().slice(0, 6).toUpperCase();
const serial = `C210-E2E-${tag}`;
const householderEmail = `sam-${tag.toLowerCase()}@example.com`;
const modelName = `8 kW air-source ${tag}, 10 kΩ input`;
const sensor = { r25Ohm: 10_000, betaK: 3977 };

/** A browser context carrying a session from the API sign-in. */
async function contextFor(cookie: string): Promise<BrowserContext> {
  const ctx = await browser.newContext({ viewport: { width: 430, height: 932 } });
  await ctx.addCookies(
    cookie.split('; ').map((pair) => {
      const i = pair.indexOf('=');
      return { name: pair.slice(0, i), value: pair.slice(i + 1), url: baseUrl() };
    }),
  );
  return ctx;
}

async function saveStep(page: Page, nextTitle: string) {
  await page.getByRole('button', { name: /Save and continue|Continue without waiting/ }).click();
  await page.getByRole('heading', { level: 2, name: nextTitle }).waitFor({ timeout: 10_000 });
}

beforeAll(async () => {
  // Chromium's built-in fake camera (a moving test pattern), allowed without asking, for the serial scanner.
  browser = await launchBrowser(['--use-fake-device-for-media-stream', '--use-fake-ui-for-media-stream']);
  engineerCookie = await signIn(baseUrl(), 'engineer@kestrelvale.example.com', 'heatlayer-demo');
  context = await contextFor(engineerCookie);
  // The company's administrator keeps the list of heat-pump models.
  const admin = { base: baseUrl(), cookie: await signInAs(baseUrl(), 'admin', 'kestrel-vale') };
  const m = await call(admin, 'POST', '/api/commissioning/heat-pump-models', {
    name: modelName,
    outputW: 8000,
    ntcR25Ohm: sensor.r25Ohm,
    ntcBetaK: sensor.betaK,
  });
  if (m.status !== 201) throw new Error(`Adding the heat-pump model answered ${m.status}: ${JSON.stringify(m.body)}`);
}, 60_000);

afterAll(async () => {
  await browser?.close();
  await closeTestDb();
});

describe('commissioning wizard in Chromium, as a field engineer', () => {
  it('commissions a new cylinder, sees its first telemetry live, and hands over with a PDF and an invitation', async () => {
    const since = new Date();
    const page = await context.newPage();
    const consoleErrors: string[] = [];
    page.on('pageerror', (e) => consoleErrors.push(e.message));

    await page.goto(`${baseUrl()}/commissioning`);
    await waitForIslands(page);
    await page.getByRole('button', { name: 'Start a new commissioning' }).click();
    await page.waitForURL(/\/commissioning\/[0-9a-f-]{36}$/);
    const id = page.url().split('/').pop()!;
    await waitForIslands(page);

    // 1. Home and householder
    await page.getByRole('heading', { level: 2, name: 'Home and householder' }).waitFor();
    await page.fill('#f-addressLine', '12 Heron Close');
    await page.fill('#f-town', 'Ashby Wend');
    await page.fill('#f-postcode', 'WM2 8HC');
    await page.fill('#f-occupants', '4');
    await page.fill('#f-contactName', 'Sam Example');
    await page.fill('#f-contactEmail', householderEmail);
    await saveStep(page, 'Cylinder');

    // 2. Cylinder. The scanner shows the camera (a test pattern with no code: nothing is read) and
    // stops it again; the serial is then typed.
    await page.getByRole('button', { name: 'Scan the code' }).click();
    const camera = page.getByLabel('Camera view for scanning the serial');
    await camera.waitFor({ timeout: 15_000 });
    await page.waitForFunction(
      () =>
        ((document.querySelector('[aria-label="Camera view for scanning the serial"]') as HTMLMediaElement | null)
          ?.readyState ?? 0) >= 2,
      undefined,
      { timeout: 15_000 },
    );
    await page.getByRole('button', { name: 'Stop scanning' }).click();
    await expect(camera.count()).resolves.toBe(0);
    // A bad value first, refused with the field named
    await page.fill('#f-serial', serial);
    await page.fill('#f-model', 'C210 cylinder');
    await page.fill('#f-volumeL', 'two hundred');
    await page.fill('#f-heightM', '1.6');
    await page.fill('#f-sensorCount', '6');
    await page.selectOption('#f-exchanger', 'plate_ports');
    await page.fill('#f-immersionW', '3000');
    await page.getByRole('button', { name: 'Save and continue' }).click();
    await expect(page.locator('#f-volumeL-error').textContent()).resolves.toBe(
      'Enter the volume as a number (litres).',
    );
    await page.fill('#f-volumeL', '210');
    await page.fill('#f-declaredLossW', '1.6');
    await saveStep(page, 'Heat source and sensor input');

    // Resumable: a reload (or another device) opens the draft where it was left, answers kept.
    await page.reload();
    await waitForIslands(page);
    await page.getByRole('heading', { level: 2, name: 'Heat source and sensor input' }).waitFor();
    await page.getByRole('button', { name: /2\s*Cylinder/ }).click();
    await expect(page.inputValue('#f-serial')).resolves.toBe(serial);
    await page.getByRole('button', { name: /3\s*Heat source and sensor input/ }).click();

    // 3. Heat source, from the company's list of models; the settings come from the thermal core
    await page.selectOption('#f-heatSource', 'hp_plate');
    await page.selectOption('#f-heatPumpModelId', { label: `${modelName} (8.0 kW, NTC 10 kΩ, B 3977 K)` });
    await expect(page.inputValue('#f-ntcR25Ohm')).resolves.toBe('10000');
    await page.fill('#f-callC', '6');
    await page.fill('#f-satisfiedC', '47');
    const core = thermistorSettings({ sensor, callC: 6, satisfiedC: 47 });
    const call6 = page.locator('[data-setting="call"] [data-ohm]');
    const sat47 = page.locator('[data-setting="satisfied"] [data-ohm]');
    await expect(call6.getAttribute('data-ohm')).resolves.toBe(String(Math.round(core.callOhm)));
    await expect(sat47.getAttribute('data-ohm')).resolves.toBe(String(Math.round(core.satisfiedOhm)));
    // 10 kΩ NTC, B ≈ 3977 K: ≈ 25 kΩ at ≈ 6 °C and ≈ 4 kΩ at ≈ 47 °C (common practice).
    expect(await call6.textContent()).toBe('24.79 kΩ');
    expect(Number((await sat47.textContent())!.replace(' kΩ', ''))).toBeCloseTo(4.0, 1);
    await expect(page.locator('[data-setting="call"] ol').textContent()).resolves.toContain(
      'R = 10,000 Ω × exp(0.9079) = 24,791 Ω',
    );
    await screenshot(page, 'commissioning-heat-source');
    await saveStep(page, 'Target temperature');

    // 4. Target, with the legionella and scalding cautions
    await expect(page.inputValue('#f-targetC')).resolves.toBe('60');
    await expect(page.getByRole('note').filter({ hasText: 'HSG274' }).count()).resolves.toBe(1);
    await expect(page.getByRole('note').filter({ hasText: 'scalds at the tap' }).count()).resolves.toBe(1);
    await saveStep(page, 'Programmer and thermostat');

    // 5. Controls
    await page.selectOption('#f-externalControl', 'none');
    await saveStep(page, 'Connection check');

    // 6. Connection: register, enter the token in the "controller", wait for the first reading live
    await page.getByRole('button', { name: 'Register the cylinder and issue its token' }).click();
    const tokenBox = page.locator('[data-device-token]');
    await tokenBox.waitFor();
    const token = (await tokenBox.getAttribute('data-device-token'))!;
    await page.getByText('Waiting for the first reading from the cylinder').waitFor();
    const layers = [14.5, 21, 33.5, 47, 54.5, 58.5];
    const ingest = await sendReading(baseUrl(), token, layers);
    expect(ingest.status).toBe(202);
    await page.locator('[data-connection="received"]').waitFor({ timeout: 15_000 });
    await expect(page.locator('[data-layer="5"]').textContent()).resolves.toContain('58.5 °C');
    await expect(page.locator('[data-layer="0"]').textContent()).resolves.toContain('14.5 °C');
    await screenshot(page, 'commissioning-connection');
    await saveStep(page, 'Safety checklist');

    // 7. Safety checklist, with the competent-person caution
    await expect(page.getByRole('note').filter({ hasText: 'competent, licensed person' }).count()).resolves.toBe(1);
    for (const item of ['expansion', 'reliefValve', 'discharge', 'reducingValve', 'isolation', 'competentPerson'])
      await page.check(`#f-${item}`);
    await saveStep(page, 'Photos and documents');

    // 8. Photos: a wrong file is refused with a clear message, a photo is kept
    await page.setInputFiles('#upload-file', {
      name: 'notes.txt',
      mimeType: 'text/plain',
      buffer: Buffer.from('not a photo'),
    });
    await expect(page.getByRole('alert').textContent()).resolves.toMatch(
      /“notes.txt” is not a photo \(JPEG, PNG or WebP\) or a PDF document/,
    );
    await screenshot(page, 'commissioning-upload-refused');
    await page.setInputFiles('#upload-file', {
      name: 'data-plate.jpg',
      mimeType: 'image/jpeg',
      buffer: await jpegPhoto(1200, 900),
    });
    await page.locator('[data-upload]').first().waitFor();
    await page.waitForFunction(() =>
      [...document.querySelectorAll('[data-upload] img')].every(
        (i) => (i as HTMLImageElement).complete && (i as HTMLImageElement).naturalWidth > 0,
      ),
    );
    await screenshot(page, 'commissioning-photos');
    await saveStep(page, 'Sign-off and handover');

    // 9. Sign-off
    await expect(page.inputValue('#f-householderEmail')).resolves.toBe(householderEmail);
    await page.getByRole('button', { name: 'Sign off and send' }).click();
    await page.locator('[data-signed="true"]').waitFor({ timeout: 20_000 });
    await screenshot(page, 'commissioning-signed');

    // The tank is commissioned with the wizard's answers.
    const [tank] = await query<{
      id: string;
      commissioned_at: Date | null;
      heat_source: string;
      sensor_count: number;
      target_c: number;
    }>('select id, commissioned_at, heat_source, sensor_count, target_c from tanks where serial = $1', [serial]);
    expect(tank).toMatchObject({ heat_source: 'hp_plate', sensor_count: 6, target_c: 60 });
    expect(tank.commissioned_at).not.toBeNull();

    // The PDF, parsed back.
    const pdfRes = await fetch(`${baseUrl()}/api/commissioning/${id}/record.pdf`, {
      headers: { cookie: engineerCookie },
    });
    expect(pdfRes.status).toBe(200);
    const text = await pdfText(new Uint8Array(await pdfRes.arrayBuffer()));
    for (const expected of [
      'Hot-water cylinder commissioning record',
      'Kestrel Vale Heating Co-operative',
      serial,
      '12 Heron Close, Ashby Wend WM2 8HC',
      'Heat pump through a plate heat exchanger',
      '24.79 kohm (reads 6 °C)',
      '60 °C, reheat 5 K below',
      '14.5 °C, 21.0 °C, 33.5 °C, 47.0 °C, 54.5 °C, 58.5 °C',
      'engineer@kestrelvale.example.com',
      'competent, licensed person',
      'HSG274',
    ])
      expect(text).toContain(expected);

    // The signed record page.
    await page.goto(`${baseUrl()}/commissioning/${id}`);
    await expect(page.getByRole('heading', { level: 1 }).textContent()).resolves.toBe(
      `Commissioning record · ${serial}`,
    );
    await screenshot(page, 'commissioning-record');
    expect(consoleErrors).toEqual([]);
    await page.close();

    // The householder's invitation arrived and works: a new account that sees this home.
    const invitation = await waitForMail(householderEmail, /invitation to Heatlayer/, since);
    const recordMail = await waitForMail(householderEmail, /commissioning record/, since);
    expect(recordMail.text).toContain(serial);
    const link = linkIn(invitation, `${baseUrl()}/accept-invitation?token=`);
    const guest = await browser.newContext({ viewport: { width: 430, height: 932 } });
    const hp = await guest.newPage();
    await hp.goto(link);
    await waitForIslands(hp);
    await hp.getByLabel('Choose a password').fill(`correct horse ${tag} staple`);
    await hp.getByRole('button', { name: 'Create my account' }).click();
    await hp.waitForURL((u) => !u.pathname.startsWith('/accept-invitation'), { timeout: 15_000 });
    const me = await hp.evaluate(async () => (await fetch('/api/me')).json());
    const [home] = await query<{ home_id: string }>('select home_id from commissionings where id = $1', [id]);
    expect(me).toMatchObject({ email: householderEmail, role: 'householder', homeIds: [home.home_id] });
    // Only for the screenshot: let the householder's page finish loading (its own tests check it).
    await hp
      .waitForFunction(() => !document.body.innerText.includes('Checking your hot water'), undefined, {
        timeout: 15_000,
      })
      .catch(() => undefined);
    await screenshot(hp, 'commissioning-householder-signed-in');
    await guest.close();
  }, 180_000);
});
