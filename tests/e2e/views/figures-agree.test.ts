// One tank, one set of figures: for a healthy cylinder and for each sensor fault, the readings go
// through the real writer (POST /api/ingest), and the fleet list, the fleet summary, the tank API,
// the tank page and the householder's page must give the same figures, estimated or withheld alike.
import { randomUUID } from 'node:crypto';
import { hash } from '@node-rs/argon2';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { hashDeviceToken } from '../../../src/lib/telemetry/device-token';
import { tankFigures, type TankFigures } from '../../../src/lib/thermal';
import { fmtL, fmtPct } from '../../../src/lib/views/format';
import { householdWords, qualityMark } from '../../../src/lib/views/quality-words';
import { baseUrl, launchBrowser, screenshot, waitForIslands } from '../../support/browser';
import { closeTestDb, query } from '../../support/db';
import { signIn } from '../../support/session';
import { dropCompany, ownCompany, staffOf } from '../../integration/energy/fixtures';
import { signedInContext } from './helpers';

const SENSORS = 6;
const GEOMETRY = { volumeL: 200, heightM: 1.5, sensorCount: SENSORS, targetC: 55 };
const MINUTES = 130; // longer than the stuck check's 120-minute window (sensor-check.ts defaults)

/**
 * A stratified column at minute m, bottom to top (invented demo values): sensor 2 warms by 6 K over
 * the run (a neighbour that moves, so a stuck sensor can be told), every sensor wiggles by up to
 * 0.4 K (so none of the healthy ones looks stuck).
 */
const column = (m: number): number[] =>
  [15, 20 + (6 * m) / MINUTES, 34, 47, 54, 58].map((t, k) => Math.round((t + ((m + k) % 5) * 0.1) * 100) / 100);

type Fault = {
  name: string;
  apply: (c: (number | null)[], m: number) => (number | null)[];
  status: TankFigures['quality']['status'];
  leftOut: number[];
};
const faults: Fault[] = [
  { name: 'healthy', apply: (c) => c, status: 'measured', leftOut: [] },
  { name: 'missing', apply: (c) => c.map((t, k) => (k === 2 ? null : t)), status: 'estimated', leftOut: [3] },
  // An open thermistor reads far below any water temperature (the wire allows down to −10 °C).
  { name: 'open', apply: (c) => c.map((t, k) => (k === 2 ? -10 : t)), status: 'estimated', leftOut: [3] },
  { name: 'stuck', apply: (c) => c.map((t, k) => (k === 2 ? 34 : t)), status: 'estimated', leftOut: [3] },
  // Sensors 2 and 5 swapped: a 54 °C reading low down and a 20-odd °C one near the top.
  {
    name: 'swapped',
    apply: (c) => c.map((t, k) => (k === 1 ? c[4]! : k === 4 ? c[1]! : t)),
    status: 'estimated',
    leftOut: [2, 5],
  },
  { name: 'top-out', apply: (c) => c.map((t, k) => (k === SENSORS - 1 ? null : t)), status: 'withheld', leftOut: [6] },
  {
    name: 'two-adjacent',
    apply: (c) => c.map((t, k) => (k === 2 || k === 3 ? null : t)),
    status: 'withheld',
    leftOut: [3, 4],
  },
];

interface Case {
  fault: Fault;
  tankId: string;
  serial: string;
  homeId: string;
  householder: string;
  expected: TankFigures;
}

let browser: Browser;
let company: Awaited<ReturnType<typeof ownCompany>>;
let operator: string;
const cases: Case[] = [];

async function householderOf(homeId: string): Promise<string> {
  const email = `home-${randomUUID().slice(0, 8)}@${company.domain}`;
  const [u] = await query<{ id: string }>(
    `insert into "user" (id, email, name, password_hash, "emailVerified") values ($1, $2, 'Test householder', $3, now()) returning id`,
    [randomUUID(), email, await hash('figures-test-password')],
  );
  await query('insert into memberships (user_id, company_id, role) values ($1, $2, $3)', [
    u!.id,
    company.id,
    'householder',
  ]);
  await query('insert into home_members (home_id, user_id) values ($1, $2)', [homeId, u!.id]);
  return signIn(baseUrl(), email, 'figures-test-password');
}

beforeAll(async () => {
  [browser, company] = await Promise.all([launchBrowser(), ownCompany('Figures')]);
  operator = await staffOf(company, 'operator');
  const end = Date.now() - 60_000;
  for (const fault of faults) {
    const token = `figures-${randomUUID()}`;
    const [home] = await query<{ id: string }>(
      `insert into homes (company_id, reference, address_line, town, postcode, occupants) values ($1, $2, $3, 'Tarnfield', 'WM9 5ZZ', 2) returning id`,
      [company.id, `FG-${fault.name}`, `${fault.name} Test Lane`],
    );
    const serial = `FG${company.tag.slice(0, 4).toUpperCase()}-${fault.name}`;
    const [tank] = await query<{ id: string }>(
      `insert into tanks (company_id, home_id, serial, model, volume_l, height_m, sensor_count, heat_source, hp_output_w, immersion_w, target_c, hysteresis_k, device_token_hash, commissioned_at)
       values ($1, $2, $3, 'C200 cylinder', $4, $5, $6, 'hp_plate', 5000, 3000, $7, 5, $8, now() - interval '30 days') returning id`,
      [
        company.id,
        home!.id,
        serial,
        GEOMETRY.volumeL,
        GEOMETRY.heightM,
        SENSORS,
        GEOMETRY.targetC,
        hashDeviceToken(token),
      ],
    );
    const readings = Array.from({ length: MINUTES }, (_, m) => ({
      ts: end - (MINUTES - 1 - m) * 60_000,
      layersC: fault.apply(column(m), m),
      compressor: false,
      immersionW: 0,
      drawLpm: 0,
    }));
    const res = await fetch(`${baseUrl()}/api/ingest`, {
      method: 'POST',
      headers: { authorization: `Bearer ${token}`, 'content-type': 'application/json' },
      body: JSON.stringify({ readings }),
    });
    expect(res.status, await res.clone().text()).toBeLessThan(300);
    // What the thermal core makes of the last reading (the stuck tank: sensor 3, 0-based 2, held stuck).
    const expected = tankFigures(readings.at(-1)!, GEOMETRY, { stuck: fault.name === 'stuck' ? [2] : [] });
    cases.push({
      fault,
      tankId: tank!.id,
      serial,
      homeId: home!.id,
      householder: await householderOf(home!.id),
      expected,
    });
  }
}, 240_000);
afterAll(async () => {
  await browser?.close();
  if (company) await dropCompany(company.id);
  await closeTestDb();
});

async function api<T = any>(path: string, cookie: string): Promise<T> {
  const res = await fetch(`${baseUrl()}${path}`, { headers: { cookie } });
  expect(res.status, path).toBe(200);
  return res.json() as Promise<T>;
}

describe('one tank, the same figures everywhere, for each sensor fault', () => {
  it('the writer, the tank list, the tank API and the fleet summary agree, and say what was left out', async () => {
    const list = await api(`/api/tanks?pageSize=50&sort=serial`, operator);
    expect(list.total).toBe(faults.length);
    for (const c of cases) {
      const item = list.items.find((i: any) => i.id === c.tankId);
      const detail = await api(`/api/tanks/${c.tankId}`, operator);
      // Which sensors are left out follows from the fault put in (sensor-check.ts rules).
      expect(detail.figures.quality.status, c.fault.name).toBe(c.fault.status);
      expect(detail.figures.quality.leftOut, c.fault.name).toEqual(c.fault.leftOut);
      expect(detail.figures.quality.reason === null, c.fault.name).toBe(c.fault.status === 'measured');
      // The writer stored the thermal core's figures of the last reading, and the page's API recomputes the same.
      for (const f of [item, detail.figures]) {
        if (c.expected.v40L === null) expect([f.v40L, f.soc], c.fault.name).toEqual([null, null]);
        else {
          expect(f.v40L, c.fault.name).toBeCloseTo(c.expected.v40L, 3);
          expect(f.soc, c.fault.name).toBeCloseTo(c.expected.soc!, 5);
        }
      }
      expect(item.quality, c.fault.name).toEqual(detail.figures.quality);
      // Analyses still run on an estimated column and carry the same mark; withheld readings are not used.
      expect(detail.analysis.quality.status, c.fault.name).toBe(c.fault.status);
      expect(detail.analysis.quality.leftOut, c.fault.name).toEqual(c.fault.leftOut);
      expect(detail.analysis.legionella === null, c.fault.name).toBe(c.fault.status === 'withheld');
    }
    // Withheld figures never become a number: the estimate of a V40 with a top sensor missing is none.
    expect(cases.filter((c) => c.fault.status === 'withheld').every((c) => c.expected.v40L === null)).toBe(true);

    const summary = await api(`/api/fleet/summary`, operator);
    expect(summary.tanks).toBe(faults.length);
    expect(summary.figuresQuality).toEqual({ measured: 1, estimated: 4, withheld: 2 });
    const listed = list.items.reduce((a: number, i: any) => a + (i.v40L ?? 0), 0);
    expect(summary.totalV40L).toBeCloseTo(listed, 3);
  });

  it('the fleet page shows those figures, marked, or the reason they are withheld', async () => {
    const desk = await signedInContext(browser, operator);
    const page = await desk.newPage();
    await page.goto(`${baseUrl()}/fleet`);
    await waitForIslands(page);
    for (const c of cases) {
      const row = page.locator('tbody tr', { hasText: c.serial });
      await row.waitFor({ timeout: 20_000 });
      const mark = qualityMark(c.expected.quality);
      const v40 = c.fault.status === 'withheld' ? mark : `${fmtL(c.expected.v40L)}${mark ?? ''}`;
      const soc = c.fault.status === 'withheld' ? mark : `${fmtPct(c.expected.soc)}${mark ?? ''}`;
      await expect(row.getByTestId('v40').textContent(), c.fault.name).resolves.toBe(v40);
      await expect(row.getByTestId('soc').textContent(), c.fault.name).resolves.toBe(soc);
    }
    const total = cases.reduce((a, c) => a + (c.expected.v40L ?? 0), 0);
    await expect(page.locator('[data-figure="V40 across the fleet"]').textContent()).resolves.toBe(
      `${Math.round(total).toLocaleString('en-GB')} L`,
    );
    await expect(page.locator('[data-figure="Figures estimated"]').textContent()).resolves.toBe('4');
    await expect(page.locator('[data-figure="Figures withheld"]').textContent()).resolves.toBe('2');
    await screenshot(page, 'figures-fleet');
    await desk.close();
  }, 90_000);

  it('the tank page shows the same figures with the note saying what was left out, or why they are withheld', async () => {
    const desk = await signedInContext(browser, operator);
    const page = await desk.newPage();
    for (const c of cases) {
      await page.goto(`${baseUrl()}/tanks/${c.tankId}`);
      await waitForIslands(page);
      const v40 = page.locator('[data-figure="V40"]');
      await v40.waitFor();
      if (c.fault.status === 'withheld') {
        await expect(v40.textContent(), c.fault.name).resolves.toBe('withheld');
      } else {
        await expect(v40.textContent(), c.fault.name).resolves.toBe(
          `${fmtL(c.expected.v40L)}${c.fault.status === 'estimated' ? 'est.' : ''}`,
        );
        await expect(page.locator('[data-figure="State of charge"]').textContent(), c.fault.name).resolves.toBe(
          `${fmtPct(c.expected.soc)}${c.fault.status === 'estimated' ? 'est.' : ''}`,
        );
      }
      const note = page.locator('section[aria-label="Now"] [data-testid="figures-quality"]');
      if (c.fault.status === 'measured') await expect(note.count()).resolves.toBe(0);
      else await expect(note.textContent(), c.fault.name).resolves.toBe(c.expected.quality.reason);
      if (c.fault.name !== 'healthy') await screenshot(page, `figures-tank-${c.fault.name}`);
    }
    await desk.close();
  }, 120_000);

  it('the householder page shows the same litres, or plain words and no number', async () => {
    for (const c of cases) {
      const home = await signedInContext(browser, c.householder, { width: 390, height: 844 });
      const p = await home.newPage();
      await p.goto(`${baseUrl()}/home`);
      await waitForIslands(p);
      await p.getByRole('heading', { name: 'Warm water ready now' }).waitFor();
      if (c.fault.status === 'withheld') {
        // Plain words, and no number at all.
        await expect(p.getByTestId('litres-unknown').textContent(), c.fault.name).resolves.toBe(
          householdWords(c.expected.quality),
        );
        await expect(p.getByTestId('litres-now').count()).resolves.toBe(0);
      } else {
        await expect(p.getByTestId('litres-now').textContent(), c.fault.name).resolves.toBe(
          String(Math.round(c.expected.v40L!)),
        );
        await expect(p.getByTestId('litres-estimated').count(), c.fault.name).resolves.toBe(
          c.fault.status === 'estimated' ? 1 : 0,
        );
      }
      const html = (await p.content()).toLowerCase();
      for (const jargon of ['v40', 'withheld', 'left out', 'sensor 3'])
        expect(html, c.fault.name).not.toContain(jargon);
      if (c.fault.name === 'missing' || c.fault.name === 'top-out') await screenshot(p, `figures-home-${c.fault.name}`);
      await home.close();
    }
  }, 120_000);
});
