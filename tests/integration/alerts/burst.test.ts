// The same readings arriving many times and all at once (a device replaying its backlog while the
// worker is redelivered the same batch) open one alert, not several; thresholds a company sets
// apply from the next evaluation.
import { afterAll, describe, expect, it } from 'vitest';
import { getPool } from '../../../src/db';
import { saveThresholdOverrides } from '../../../src/db/queries/alerts';
import { evaluateTankReadings } from '../../../src/lib/alerts/evaluate.server';
import { TelemetryWriter, type IngestItem } from '../../../src/lib/telemetry/writer.server';
import { runClock } from '../../../src/lib/alerts/runner.server';
import { query } from '../../support/db';
import {
  MIN,
  addTank,
  alertsOf,
  createCompany,
  dropCompany,
  openKinds,
  startDaysAgo,
  type AlertCompany,
} from './harness';

let company: AlertCompany | undefined;
afterAll(async () => {
  await dropCompany(company);
}, 60_000);

describe('a burst of readings', () => {
  it('opens one alert however often and however concurrently the readings arrive', async () => {
    company = await createCompany();
    const t = await addTank(company, 3, ['sensor_open']);
    const start = startDaysAgo(10);
    const items: IngestItem[] = [];
    for (let i = 0; i < 120; i++) {
      items.push({
        tank: {
          id: t.id,
          serial: t.serial,
          companyId: company.id,
          sensorCount: t.demo.sensorCount,
          volumeL: t.demo.volumeL,
          targetC: 60,
        },
        reading: t.sim.step(start + i * MIN),
      });
    }
    const writer = new TelemetryWriter(getPool());
    await Promise.all([1, 2, 3, 4].map(() => writer.write({ readings: items })));
    await Promise.all([1, 2, 3, 4, 5].map(() => evaluateTankReadings(t.id)));
    await writer.write({ readings: items.slice(60) });
    await evaluateTankReadings(t.id);
    const alerts = await alertsOf([t.id]);
    expect(alerts.map((a) => [a.kind, a.state])).toEqual([['sensor_fault', 'open']]);
    const [s] = await query<{ ms: string }>(
      `select (extract(epoch from evaluated_to) * 1000)::int8 as ms from alert_tank_state where tank_id = $1`,
      [t.id],
    );
    expect(Number(s!.ms)).toBe(start + 119 * MIN);
  });

  it('applies a company threshold at its edge: silent for exactly the limit is on line, a moment longer is offline', async () => {
    const t = await addTank(company!, 27);
    const start = startDaysAgo(9);
    const writer = new TelemetryWriter(getPool());
    const items: IngestItem[] = [0, 1, 2].map((i) => ({
      tank: {
        id: t.id,
        serial: t.serial,
        companyId: company!.id,
        sensorCount: t.demo.sensorCount,
        volumeL: t.demo.volumeL,
        targetC: 60,
      },
      reading: t.sim.step(start + i * MIN),
    }));
    await writer.write({ readings: items });
    await evaluateTankReadings(t.id);
    const last = start + 2 * MIN;
    await saveThresholdOverrides(company!.id, { offlineAfterMin: 30 }, company!.operator.id);
    await query('update tank_latest_state set ts = $2 where tank_id = $1', [t.id, new Date(last)]);
    // "No reading for longer than" the limit: exactly 30 min silent is still on line (common practice edge).
    await runClock(last + 30 * MIN, { companyId: company!.id, log: () => undefined });
    expect(await openKinds(t.id)).toEqual([]);
    await runClock(last + 30 * MIN + 1, { companyId: company!.id, log: () => undefined });
    expect(await openKinds(t.id)).toEqual(['offline']);
    const [a] = (await alertsOf([t.id])).filter((x) => x.kind === 'offline');
    expect(a!.opened_at.getTime()).toBe(last + 30 * MIN);
    expect(a!.evidence.facts.offlineAfterMin).toBe(30);
  });

  it('does not call a tank offline while it is replaying old readings: receipt counts as being heard', async () => {
    const t = await addTank(company!, 18);
    const now = Date.now();
    const oldTs = now - 3 * 86_400_000; // a backlog three days old, received just now
    const writer = new TelemetryWriter(getPool());
    await writer.write({
      readings: [
        {
          tank: {
            id: t.id,
            serial: t.serial,
            companyId: company!.id,
            sensorCount: t.demo.sensorCount,
            volumeL: t.demo.volumeL,
            targetC: 60,
          },
          reading: t.sim.step(oldTs),
        },
      ],
    });
    await evaluateTankReadings(t.id);
    await runClock(Date.now() + 1000, { companyId: company!.id, log: () => undefined });
    expect(await openKinds(t.id)).toEqual([]);
    // Heard nothing for longer than the limit (30 min set above): offline.
    await query('update tank_latest_state set last_seen_at = $2 where tank_id = $1', [t.id, new Date(now - 31 * MIN)]);
    await runClock(now, { companyId: company!.id, log: () => undefined });
    expect(await openKinds(t.id)).toEqual(['offline']);
  });

  it('on the real clock, judges each tank when it looks at it: a backlog received during a long turn is heard', async () => {
    const t = await addTank(company!, 15);
    const tank = {
      id: t.id,
      serial: t.serial,
      companyId: company!.id,
      sensorCount: t.demo.sensorCount,
      volumeL: t.demo.volumeL,
      targetC: 60,
    };
    const writer = new TelemetryWriter(getPool());
    await writer.write({ readings: [{ tank, reading: t.sim.step(Date.now() - 3 * 86_400_000) }] });
    const turnStarted = Date.now();
    // The backlog's next day arrives while the turn is still busy with other tanks.
    await new Promise((r) => setTimeout(r, 20));
    await writer.write({ readings: [{ tank, reading: t.sim.step(Date.now() - 2 * 86_400_000) }] });
    // Judged when it is looked at, the tank was heard just now: on line.
    await runClock(Date.now, { companyId: company!.id, log: () => undefined });
    expect(await openKinds(t.id)).toEqual([]);
    // Judged at the turn's start, that receipt would be no evidence (simulated-time clocks rely on
    // that), and the tank would look silent since its newest reading, two days old.
    await runClock(turnStarted, { companyId: company!.id, log: () => undefined });
    expect(await openKinds(t.id)).toEqual(['offline']);
  });
});
