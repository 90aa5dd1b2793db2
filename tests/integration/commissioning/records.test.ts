import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { thermistorSettings } from '../../../src/lib/thermal/index';
import { baseUrl } from '../../support/browser';
import { closeTestDb, query } from '../../support/db';
import { waitForMail } from '../../support/mail';
import { signInAs } from '../../support/session';
import {
  call,
  commissionOverHttp,
  jpegPhoto,
  pdfText,
  sampleAnswers,
  sendReading,
  type Api,
} from '../../support/commissioning';

let engineer: Api;
let operator: Api;
let orrin: Api;
beforeAll(async () => {
  engineer = { base: baseUrl(), cookie: await signInAs(baseUrl(), 'engineer', 'kestrel-vale') };
  operator = { base: baseUrl(), cookie: await signInAs(baseUrl(), 'operator', 'kestrel-vale') };
  orrin = { base: baseUrl(), cookie: await signInAs(baseUrl(), 'engineer', 'orrin-bay') };
});
afterAll(closeTestDb);

describe('commissioning records over the API', () => {
  it('names the failing fields of a step and keeps the draft unchanged', async () => {
    const {
      body: { id },
    } = await call(engineer, 'POST', '/api/commissioning', {});
    const r = await call(engineer, 'PATCH', `/api/commissioning/${id}`, {
      step: 'cylinder',
      values: { serial: 'has spaces', volumeL: 'big' },
    });
    expect(r.status).toBe(422);
    expect(r.body.error.fields).toEqual(
      expect.arrayContaining([
        { field: 'cylinder.serial', message: expect.stringMatching(/letters, digits, dots, dashes or underscores/) },
        { field: 'cylinder.volumeL', message: 'Enter the volume as a number (litres).' },
        { field: 'cylinder.exchanger', message: 'Choose the cylinder’s heat exchanger.' },
      ]),
    );
    const draft = await call(engineer, 'GET', `/api/commissioning/${id}`);
    expect(draft.body.data).toEqual({});
    expect((await call(orrin, 'GET', `/api/commissioning/${id}`)).status).toBe(404);
  });

  it('will not sign off before the cylinder has reported', async () => {
    const a = sampleAnswers();
    const {
      body: { id },
    } = await call(engineer, 'POST', '/api/commissioning', {});
    for (const step of ['home', 'cylinder', 'heat_source', 'target', 'controls', 'safety', 'signoff'] as const) {
      expect((await call(engineer, 'PATCH', `/api/commissioning/${id}`, { step, values: a[step] })).status).toBe(200);
    }
    expect((await call(engineer, 'POST', `/api/commissioning/${id}/sign-off`, {})).body.error.code).toBe(
      'NotRegistered',
    );
    const reg = await call(engineer, 'POST', `/api/commissioning/${id}/registration`, {});
    expect(reg.status).toBe(201);
    const early = await call(engineer, 'POST', `/api/commissioning/${id}/sign-off`, {});
    expect([early.status, early.body.error.code]).toEqual([422, 'NoTelemetryYet']);
    // The tank exists but is not commissioned until sign-off.
    const [tank] = await query<{ commissioned_at: Date | null }>('select commissioned_at from tanks where id = $1', [
      reg.body.tankId,
    ]);
    expect(tank.commissioned_at).toBeNull();
  });

  it('signs off, locks the record, stores its PDF and e-mails the householder; later changes are amendments', async () => {
    const since = new Date();
    const answers = sampleAnswers();
    const { id, tankId, signOff } = await commissionOverHttp(engineer, answers);
    expect(signOff.status).toBe(200);

    const [row] = await query<{ status: string; handover_sent_at: Date | null; record: any }>(
      'select status, handover_sent_at, record from commissionings where id = $1',
      [id],
    );
    expect(row.status).toBe('signed');
    expect(row.handover_sent_at).not.toBeNull();
    // The record holds the settings the thermal core gives (10 kΩ, B 3977 K: ≈ 24.8 kΩ / ≈ 4.0 kΩ, common practice).
    const core = thermistorSettings({ sensor: { r25Ohm: 10_000, betaK: 3977 }, callC: 6, satisfiedC: 47 });
    expect(row.record.thermistor).toMatchObject({ callOhm: core.callOhm, satisfiedOhm: core.satisfiedOhm });
    expect(row.record.firstTelemetry.layersC).toEqual([15, 22, 35, 48, 55, 58]);
    const [tank] = await query<{ commissioned_at: Date | null; target_c: number; serial: string }>(
      'select commissioned_at, target_c, serial from tanks where id = $1',
      [tankId],
    );
    expect(tank.commissioned_at).not.toBeNull();

    const pdf = await fetch(`${baseUrl()}/api/commissioning/${id}/record.pdf`, {
      headers: { cookie: operator.cookie },
    });
    expect(pdf.headers.get('content-type')).toBe('application/pdf');
    const text = await pdfText(new Uint8Array(await pdf.arrayBuffer()));
    expect(text).toContain(answers.cylinder.serial);
    expect(text).toContain('24.79 kohm (reads 6 °C)');
    expect(
      (await fetch(`${baseUrl()}/api/commissioning/${id}/record.pdf`, { headers: { cookie: orrin.cookie } })).status,
    ).toBe(404);

    const invitation = await waitForMail(answers.signoff.householderEmail, /invitation to Heatlayer/, since);
    expect(invitation.links.some((l) => l.startsWith(`${baseUrl()}/accept-invitation?token=`))).toBe(true);
    const record = await waitForMail(answers.signoff.householderEmail, /commissioning record/, since);
    expect(record.text).toContain(answers.cylinder.serial);

    // Locked: the wizard can no longer change it, nor sign it twice.
    const edit = await call(engineer, 'PATCH', `/api/commissioning/${id}`, {
      step: 'target',
      values: { targetC: '65', hysteresisK: '5' },
    });
    expect([edit.status, edit.body.error.code]).toEqual([409, 'RecordLocked']);
    expect((await call(engineer, 'POST', `/api/commissioning/${id}/sign-off`, {})).status).toBe(409);
    const form = new FormData();
    form.set('file', new Blob([new Uint8Array(await jpegPhoto(64, 64))], { type: 'image/jpeg' }), 'late.jpg');
    form.set('commissioningId', id);
    const late = await fetch(`${baseUrl()}/api/uploads`, {
      method: 'POST',
      headers: { origin: baseUrl(), cookie: engineer.cookie },
      body: form,
    });
    expect([late.status, (await late.json()).error.code]).toEqual([409, 'RecordLocked']);

    const bad = await call(engineer, 'POST', `/api/commissioning/${id}/amendments`, {
      field: 'target.targetC',
      value: '90',
      reason: 'typo',
    });
    expect([bad.status, bad.body.error.fields]).toEqual([422, [{ field: 'value', message: 'At most 75 °C.' }]]);
    const ok = await call(engineer, 'POST', `/api/commissioning/${id}/amendments`, {
      field: 'target.targetC',
      value: '65',
      reason: 'Householder asked for hotter water at the taps',
    });
    expect(ok.status).toBe(201);
    expect(ok.body.amendment).toMatchObject({ field: 'target.targetC', oldValue: 60, newValue: 65 });
    const [amendment] = await query<{ email: string; created_at: Date }>(
      'select u.email, a.created_at from commissioning_amendments a join "user" u on u.id = a.user_id where a.commissioning_id = $1',
      [id],
    );
    expect(amendment.email).toBe('engineer@kestrelvale.example.com');
    const [after] = await query<{ target_c: number; record: any }>(
      'select t.target_c, c.record from tanks t join commissionings c on c.tank_id = t.id where t.id = $1',
      [tankId],
    );
    expect(after.target_c).toBe(65);
    expect(after.record.answers.target.targetC).toBe(60); // the signed original is untouched
    expect(
      (
        await call(operator, 'POST', `/api/commissioning/${id}/amendments`, {
          field: 'target.targetC',
          value: '60',
          reason: 'desk',
        })
      ).status,
    ).toBe(403);
  });

  it('refuses a serial that is already registered', async () => {
    const [taken] = await query<{ serial: string }>('select serial from tanks limit 1');
    const {
      body: { id },
    } = await call(engineer, 'POST', '/api/commissioning', {});
    const r = await call(engineer, 'PATCH', `/api/commissioning/${id}`, {
      step: 'cylinder',
      values: { ...sampleAnswers().cylinder, serial: taken.serial },
    });
    expect([r.status, r.body.error.code, r.body.error.fields]).toEqual([
      409,
      'SerialTaken',
      [{ field: 'cylinder.serial', message: 'Already registered.' }],
    ]);
  });

  it('issues a device token that the ingest accepts, and a new one replaces it', async () => {
    const a = sampleAnswers();
    const {
      body: { id },
    } = await call(engineer, 'POST', '/api/commissioning', {});
    for (const step of ['home', 'cylinder', 'heat_source', 'target'] as const)
      await call(engineer, 'PATCH', `/api/commissioning/${id}`, { step, values: a[step] });
    const first = (await call(engineer, 'POST', `/api/commissioning/${id}/registration`, {})).body;
    const second = (await call(engineer, 'POST', `/api/commissioning/${id}/registration`, {})).body;
    expect(second.tankId).toBe(first.tankId);
    expect((await sendReading(baseUrl(), first.token, [20, 30, 40, 50, 55, 60])).status).toBe(401);
    expect((await sendReading(baseUrl(), second.token, [20, 30, 40, 50, 55, 60])).status).toBe(202);
    const conn = await call(engineer, 'GET', `/api/commissioning/${id}/connection`);
    expect(conn.body).toMatchObject({
      registered: true,
      received: true,
      telemetry: { layersC: [20, 30, 40, 50, 55, 60] },
    });
  });
});
