import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import mqtt from 'mqtt';
import type { Browser } from 'playwright-core';
import { topicFor } from '../../../src/lib/telemetry/wire';
import { createAccount } from '../../support/accounts';
import { baseUrl, launchBrowser, screenshot, waitForIslands } from '../../support/browser';
import { closeTestDb } from '../../support/db';
import { signIn, signInAs } from '../../support/session';
import { createFixture, dropFixture, type Fixture } from '../../integration/views/fixtures';
import { signedInContext } from './helpers';

let browser: Browser;
let fx: Fixture;
let device: mqtt.MqttClient | undefined;
beforeAll(async () => {
  [browser, fx] = await Promise.all([launchBrowser(), createFixture()]);
});
afterAll(async () => {
  await device?.endAsync();
  await browser?.close();
  if (fx) await dropFixture(fx);
  await closeTestDb();
});

/** A stand-in for the tank's controller: takes its commands from the broker and reports them applied. */
async function simulatedDevice(serial: string, token: string): Promise<mqtt.MqttClient> {
  const client = await mqtt.connectAsync(`mqtt://127.0.0.1:${process.env.MQTT_PORT}`, {
    username: serial,
    password: token,
    clientId: `${serial}-views-test`,
    reconnectPeriod: 0,
  });
  await client.subscribeAsync(topicFor(serial, 'commands'), { qos: 1 });
  client.on('message', (_topic, payload) => {
    const { id } = JSON.parse(payload.toString()) as { id: string };
    const reply = (state: string) =>
      client.publishAsync(topicFor(serial, 'replies'), JSON.stringify({ commandId: id, state, at: Date.now() }), {
        qos: 1,
      });
    void reply('acknowledged')
      .then(() => new Promise((r) => setTimeout(r, 1500)))
      .then(() => reply('applied'));
  });
  return client;
}

describe('householder in Chromium, phone width', () => {
  it('sees litres and everyday equivalents, boosts and sees it applied', async () => {
    const admin = await signInAs(baseUrl(), 'admin');
    const res = await fetch(`${baseUrl()}/api/tanks/${fx.healthy.id}/device-token`, {
      method: 'POST',
      headers: { cookie: admin, origin: baseUrl() },
    });
    expect(res.status).toBe(201);
    const { token } = (await res.json()) as { token: string };
    device = await simulatedDevice(fx.healthy.serial, token);

    const person = await createAccount({
      company: 'kestrel-vale',
      role: 'householder',
      homeId: fx.healthy.homeId,
      label: 'views-boost',
    });
    const context = await signedInContext(browser, await signIn(baseUrl(), person.email, person.password), {
      width: 390,
      height: 844,
    });
    const page = await context.newPage();
    await page.goto(`${baseUrl()}/home`);
    await waitForIslands(page);
    // V40 of the fixture's latest layers (EN 16147): 78.75 + 66.5 = 145.25 L; a shower 41 L, a bath 104 L (EN 16147 draws).
    await expect(page.getByTestId('litres-now').textContent()).resolves.toBe('145');
    await expect(page.getByTestId('everyday').textContent()).resolves.toBe('That is about 3 showers or 1 bath.');
    const html = (await page.content()).toLowerCase();
    for (const jargon of ['v40', 'state of charge', 'stratification', 'thermocline'])
      expect(html).not.toContain(jargon);
    await screenshot(page, 'views-home');

    await page.getByRole('button', { name: 'Heat water now' }).click();
    await page.locator('[data-testid="boost-status"] [data-state="applied"]').waitFor({ timeout: 30_000 });
    await expect(page.getByTestId('boost-status').textContent()).resolves.toContain('heating the water now');
    await screenshot(page, 'views-home-boosted');

    // The assumptions are shown and can be changed.
    await page.getByText('How we count showers and baths').click();
    // A size no shower has is refused beside its field, and the count stays as it was.
    await page.getByLabel('Litres per shower').fill('2');
    await page.getByRole('button', { name: 'Save' }).click();
    await expect(page.locator('#f-home-showerL-error').textContent()).resolves.toBe(
      'A shower uses at least 5 litres here.',
    );
    await expect(page.getByTestId('everyday').textContent()).resolves.toBe('That is about 3 showers or 1 bath.');
    await screenshot(page, 'views-home-sizes-refused');
    await page.getByLabel('Litres per shower').fill('60');
    await page.getByRole('button', { name: 'Save' }).click();
    await expect(page.getByTestId('everyday').textContent()).resolves.toBe('That is about 2 showers or 1 bath.');
    await page.getByTestId('assumptions-saved').waitFor();
    await context.close();
  });
});
