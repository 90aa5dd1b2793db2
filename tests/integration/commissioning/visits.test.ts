import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { baseUrl } from '../../support/browser';
import { closeTestDb, query } from '../../support/db';
import { signInAs } from '../../support/session';
import { call, commissionOverHttp, jpegPhoto, type Api } from '../../support/commissioning';

let engineer: Api;
let orrin: Api;
let tankId: string;
beforeAll(async () => {
  engineer = { base: baseUrl(), cookie: await signInAs(baseUrl(), 'engineer', 'kestrel-vale') };
  orrin = { base: baseUrl(), cookie: await signInAs(baseUrl(), 'engineer', 'orrin-bay') };
  const c = await commissionOverHttp(engineer);
  if (c.signOff.status !== 200) throw new Error(JSON.stringify(c.signOff.body));
  tankId = c.tankId;
});
afterAll(closeTestDb);

const dueSerials = async (api: Api) =>
  (await call(api, 'GET', '/api/visits?withinDays=30')).body.due as { tankId: string; state: string; dueAt: string }[];

describe('service visits', () => {
  it('lists a tank for its annual inspection a year after commissioning, then after its last inspection', async () => {
    // Annual inspection of unvented cylinders (common practice).
    expect((await dueSerials(engineer)).some((d) => d.tankId === tankId)).toBe(false);
    await query("update tanks set commissioned_at = now() - interval '13 months' where id = $1", [tankId]);
    await query("update commissionings set signed_at = now() - interval '13 months' where tank_id = $1", [tankId]);
    const due = (await dueSerials(engineer)).find((d) => d.tankId === tankId);
    expect(due?.state).toBe('overdue');
    // Another company's desk does not see it.
    expect((await dueSerials(orrin)).some((d) => d.tankId === tankId)).toBe(false);

    const form = new FormData();
    form.set('file', new Blob([new Uint8Array(await jpegPhoto(800, 600))], { type: 'image/jpeg' }), 'relief-valve.jpg');
    form.set('tankId', tankId);
    const up = await (
      await fetch(`${baseUrl()}/api/uploads`, {
        method: 'POST',
        headers: { origin: baseUrl(), cookie: engineer.cookie },
        body: form,
      })
    ).json();

    // An alert the desk raised for this tank, which the visit deals with.
    const [alert] = await query<{ id: string }>(
      `insert into alerts (company_id, tank_id, kind, severity, evidence, opened_at)
      select company_id, id, 'heat_loss', 'warning', $2::jsonb, now() - interval '2 days' from tanks where id = $1 returning id`,
      [tankId, JSON.stringify({ summary: 'Standing loss above the declared figure.', facts: {}, at: Date.now() })],
    );
    const visit = await call(engineer, 'POST', '/api/visits', {
      tankId,
      kind: 'annual_inspection',
      visitedAt: new Date().toISOString(),
      findings: 'Relief valve operated and reseated; vessel recharged.',
      parts: [{ name: 'anode', quantity: 1 }],
      readings: { topC: '58.5', inletPressureBar: '3.0', vesselPrechargeBar: '3.0', reliefValveTested: true },
      resolvedAlertIds: [alert.id],
      uploadIds: [up.upload.id],
    });
    expect(visit.status).toBe(201);
    expect(visit.body.visit.readings).toMatchObject({
      topC: 58.5,
      reliefValveTested: true,
      telemetryLayersC: [15, 22, 35, 48, 55, 58],
    });
    const [resolved] = await query<{ state: string; email: string }>(
      'select a.state, u.email from alerts a join "user" u on u.id = a.resolved_by where a.id = $1',
      [alert.id],
    );
    expect(resolved).toEqual({ state: 'resolved', email: 'engineer@kestrelvale.example.com' });
    expect(visit.body.visit.resolvedAlerts).toEqual([alert.id]);
    const [photo] = await query<{ visit_id: string }>('select visit_id from uploads where id = $1', [up.upload.id]);
    expect(photo.visit_id).toBe(visit.body.visit.id);
    expect((await dueSerials(engineer)).some((d) => d.tankId === tankId)).toBe(false);

    const page = await fetch(`${baseUrl()}/service/tanks/${tankId}`, { headers: { cookie: engineer.cookie } });
    const html = await page.text();
    expect(html).toContain('Relief valve operated and reseated');
    expect(html).toContain('1 × anode');
    expect(html).toContain('Commissioned');
    expect(html).toContain('Alerts resolved: Heat loss above declared');
    expect((await fetch(`${baseUrl()}/service/tanks/${tankId}`, { headers: { cookie: orrin.cookie } })).status).toBe(
      404,
    );
  });

  it('refuses a visit with bad readings naming the field, and stores nothing', async () => {
    const before = (await query('select id from service_visits where tank_id = $1', [tankId])).length;
    const r = await call(engineer, 'POST', '/api/visits', {
      tankId,
      kind: 'fault',
      visitedAt: new Date().toISOString(),
      findings: 'No hot water',
      readings: { inletPressureBar: '40' },
    });
    expect(r.status).toBe(400);
    expect(r.body.error.fields).toEqual([
      { field: 'readings.inletPressureBar', message: 'The incoming pressure must be at most 16 bar.' },
    ]);
    expect((await query('select id from service_visits where tank_id = $1', [tankId])).length).toBe(before);
    // An alert already resolved (the one above) cannot be resolved again: nothing is stored.
    const [done] = await query<{ id: string }>(
      "select id from alerts where tank_id = $1 and state = 'resolved' limit 1",
      [tankId],
    );
    const again = await call(engineer, 'POST', '/api/visits', {
      tankId,
      kind: 'repair',
      visitedAt: new Date().toISOString(),
      findings: 'Replaced the vessel',
      resolvedAlertIds: [done.id],
    });
    expect([again.status, again.body.error.code]).toEqual([422, 'UnknownAlerts']);
    expect((await query('select id from service_visits where tank_id = $1', [tankId])).length).toBe(before);
    const foreign = await call(orrin, 'POST', '/api/visits', {
      tankId,
      kind: 'fault',
      visitedAt: new Date().toISOString(),
      findings: 'No hot water',
    });
    expect(foreign.status).toBe(404);
  });
});
