// A simulated week and more: healthy tanks raise nothing (no false alarms), while a tank whose
// set-point was lowered (the low_setpoint fault) opens a legionella alert once a week has passed
// without the water held at 60 °C (HSE HSG274 Part 2 (2014)); the desk hears at once (severe),
// the householder in plain words unless they opted out, and the alert resolves once the
// set-point is put back and the tank holds 60 °C again.
import { afterAll, describe, expect, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import { query } from '../../support/db';
import { mailTo } from '../../support/mail';
import { setNoticePreference } from '../../../src/db/queries/alerts';
import {
  AcceleratedFleet,
  DAY,
  HOUR,
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

let company: AlertCompany | undefined;
afterAll(async () => {
  await dropCompany(company);
}, 60_000);

describe('a simulated week', () => {
  it('raises nothing on healthy tanks and a legionella alert on the tank kept at 45 °C, then resolves it', async () => {
    company = await createCompany();
    const faulty = await addTank(company, 18, ['low_setpoint'], { householder: true });
    // A second person at the same home who opted out of notices.
    const quietEmail = `quiet-${randomUUID().slice(0, 8)}@brackenfold.example.com`;
    const [quiet] = await query<{ id: string }>(
      `insert into "user" (id, email, name) values ($1, $2, 'Quiet householder') returning id`,
      [randomUUID(), quietEmail],
    );
    await query(`insert into memberships (user_id, company_id, role) values ($1, $2, 'householder')`, [
      quiet!.id,
      company.id,
    ]);
    await query('insert into home_members (home_id, user_id) values ($1, $2)', [faulty.homeId, quiet!.id]);
    await setNoticePreference(quiet!.id, false);
    const healthy = [await addTank(company, 3), await addTank(company, 27), await addTank(company, 15)];
    const start = startDaysAgo(22);
    const fleet = new AcceleratedFleet(company, [faulty, ...healthy], start, { batchMin: 60, clockMin: 10 });

    // The legionella window is 7 days: nothing can be said before, and it must open soon after.
    await fleet.run(start + 7 * DAY + 2 * HOUR, async () => (await openKinds(faulty.id)).includes('legionella_risk'));
    expect(await openKinds(faulty.id)).toEqual(['legionella_risk']);
    for (const h of healthy)
      expect(
        (await alertsOf([h.id])).map((a) => a.kind),
        `alerts of healthy tank ${h.serial} over the week`,
      ).toEqual([]);
    const [alert] = await alertsOf([faulty.id]);
    expect(alert!.severity).toBe('critical');
    expect(alert!.opened_at.getTime()).toBe(start + 7 * DAY); // the first reading plus the 7-day window
    expect(alert!.evidence.facts).toMatchObject({
      thresholdC: 60,
      holdMin: 60,
      sharePct: 50,
      windowDays: 7,
      lastHeldAt: null,
    });
    expect(alert!.evidence.facts.hottestTopC).toBeLessThan(60);

    const [severe] = await mailMatching(
      company.operator.email,
      new RegExp(`Severe: Legionella risk at ${faulty.serial}`),
    );
    expect(severe, 'the immediate e-mail to the operator').toBeDefined();
    expect(severe!.links.some((l) => l.includes(`/tanks/${faulty.id}`))).toBe(true);
    const [notice] = await mailMatching(company.householder.email, /not been getting hot enough/);
    expect(notice, 'the householder notice').toBeDefined();
    expect(notice!.text).toMatch(/60 °C/);
    expect(notice!.links.some((l) => l.endsWith('/home'))).toBe(true);
    expect(notice!.links.some((l) => l.endsWith('/alerts/preferences'))).toBe(true);
    expect(mailTo(quietEmail)).toEqual([]);

    clearFaults(faulty);
    const clearedAt = fleet.now;
    await fleet.run(clearedAt + 2 * DAY, async () => (await openKinds(faulty.id)).length === 0);
    const [after] = await alertsOf([faulty.id]);
    expect(after!.state).toBe('resolved');
    expect(after!.resolved_at!.getTime()).toBeLessThanOrEqual(clearedAt + 2 * DAY);
    // Told once: the operator's severe mail and the householder's notice were not repeated.
    expect((await mailMatching(company.operator.email, /Severe:/)).length).toBe(1);
    expect((await mailMatching(company.householder.email, /not been getting hot enough/)).length).toBe(1);
  }, 600_000);
});
