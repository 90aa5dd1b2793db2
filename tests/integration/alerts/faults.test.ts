// Each simulator fault, injected into one tank among healthy ones on an accelerated clock: exactly
// the matching alert opens within a bounded simulated time, with its evidence, reaches the desk by
// e-mail (the daily digest, read back from the fake mail server), and resolves once the fault is
// cleared; the healthy tanks raise nothing meanwhile. (Legionella, which needs a week, has its own file.)
import { afterAll, describe, expect, it } from 'vitest';
import type { FaultKind } from '../../../src/lib/demo/scenario';
import type { AlertKind } from '../../../src/lib/alerts/types';
import {
  AcceleratedFleet,
  DAY,
  HOUR,
  MIN,
  addTank,
  alertsOf,
  clearFaults,
  createCompany,
  dropCompany,
  mailMatching,
  openKinds,
  startDaysAgo,
  type AlertCompany,
} from './harness';

interface Case {
  fault: FaultKind;
  kind: AlertKind;
  opensWithinH: number;
  resolvesWithinH: number;
  evidence: (e: any, sensors: number) => void;
}

const cases: Case[] = [
  {
    fault: 'sensor_open',
    kind: 'sensor_fault',
    opensWithinH: 1,
    resolvesWithinH: 8,
    evidence: (e) => {
      expect(e.summary).toMatch(/Sensor 3 \(from the bottom\) gives no reading/);
      expect(e.facts.sensor3).toBeNull();
      expect(e.readings[0].layersC[2]).toBeNull();
    },
  },
  {
    fault: 'sensor_stuck',
    kind: 'sensor_fault',
    opensWithinH: 4,
    resolvesWithinH: 8,
    // The simulator sticks the third sensor from the top; the neighbours that go on moving give it away.
    evidence: (e, n) => {
      expect(e.summary).toMatch(new RegExp(`[Ss]ensor ${n - 2}\\b`));
      expect(e.readings).toHaveLength(1);
    },
  },
  {
    fault: 'sensors_swapped',
    kind: 'sensor_fault',
    opensWithinH: 2,
    resolvesWithinH: 8,
    evidence: (e) => {
      expect(e.summary).toMatch(/Sensor 2 reads [\d.]+ K warmer than sensor 3 above it/);
      expect(e.facts.inversion2_3K).toBeGreaterThan(3);
    },
  },
  {
    fault: 'short_cycle',
    kind: 'short_cycling',
    opensWithinH: 6,
    resolvesWithinH: 24,
    evidence: (e) => {
      expect(e.facts.violations).toBeGreaterThanOrEqual(3);
      expect(e.facts.minStartGapMin).toBe(60);
      expect(e.events.length).toBeGreaterThanOrEqual(3);
    },
  },
  {
    fault: 'network_outage',
    kind: 'offline',
    opensWithinH: 24,
    resolvesWithinH: 1,
    evidence: (e) => {
      expect(e.facts.silentMin).toBeGreaterThan(20);
      expect(e.facts.offlineAfterMin).toBe(20);
    },
  },
  {
    fault: 'immersion_stuck',
    kind: 'immersion_heavy',
    opensWithinH: 30,
    resolvesWithinH: 72,
    evidence: (e) => {
      expect(e.facts.immersionSharePct).toBeGreaterThan(20);
      expect(e.facts.limitPct).toBe(20);
    },
  },
];

const companies: AlertCompany[] = [];
afterAll(async () => {
  for (const c of companies) await dropCompany(c);
}, 60_000);

describe.each(cases)('the $fault fault', (c) => {
  it(`opens exactly a ${c.kind} alert, e-mails the desk, and resolves once cleared`, async () => {
    const company = await createCompany();
    companies.push(company);
    const faulty = await addTank(company, 18, [c.fault]);
    const healthy = [await addTank(company, 3), await addTank(company, 27), await addTank(company, 15)];
    const all = [faulty, ...healthy];
    const start = startDaysAgo(20);
    const fleet = new AcceleratedFleet(company, all, start);

    const opened = await fleet.run(start + c.opensWithinH * HOUR, async () =>
      (await openKinds(faulty.id)).includes(c.kind),
    );
    expect(await openKinds(faulty.id), `alerts on the ${c.fault} tank`).toEqual([c.kind]);
    for (const h of healthy) expect(await openKinds(h.id), `alerts on healthy tank ${h.serial}`).toEqual([]);
    const [alert] = (await alertsOf([faulty.id])).filter((a) => a.kind === c.kind);
    expect(alert!.opened_at.getTime()).toBeGreaterThanOrEqual(start);
    expect(alert!.opened_at.getTime()).toBeLessThanOrEqual(opened);
    c.evidence(alert!.evidence, faulty.demo.sensorCount);

    clearFaults(faulty);
    const clearedAt = fleet.now;
    // Run until it resolves, and on past the next 07:00 UTC so that the daily digest has gone out.
    const digestAt = Math.ceil((clearedAt - 7 * HOUR) / DAY) * DAY + 7 * HOUR + 10 * MIN;
    await fleet.run(
      Math.max(clearedAt + c.resolvesWithinH * HOUR, digestAt),
      async () => fleet.now >= digestAt && (await openKinds(faulty.id)).length === 0,
    );
    expect(await openKinds(faulty.id)).toEqual([]);
    const after = await alertsOf(all.map((t) => t.id));
    expect(after.map((a) => [a.tank_id, a.kind, a.state])).toEqual(after.map(() => [faulty.id, c.kind, 'resolved']));
    expect(after[0]!.resolved_at!.getTime()).toBeGreaterThanOrEqual(clearedAt);
    expect(after[0]!.resolved_at!.getTime()).toBeLessThanOrEqual(clearedAt + c.resolvesWithinH * HOUR);

    const digests = await mailMatching(company.operator.email, /Heatlayer daily alerts/);
    const mine = digests.find((m) => m.text.includes(faulty.serial));
    expect(mine, 'a digest naming the faulty tank').toBeDefined();
    expect(mine!.links.some((l) => l.includes(`/tanks/${faulty.id}`))).toBe(true);
    for (const h of healthy) expect(mine!.text).not.toContain(h.serial);
  }, 300_000);
});
