// The HTTP side of the pipeline over real HTTP: device ingest with bearer tokens, token rotation
// (admins) and commands (every role, within scope), against the running web server.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type pg from 'pg';
import { baseUrl } from '../../support/browser';
import { signInAs } from '../../support/session';
import { demoTanks } from '../../../src/lib/demo/scenario';
import { limits } from '../../../src/lib/telemetry/wire';
import {
  clearTelemetry,
  connectDevice,
  count,
  mqttUrl,
  reading,
  tankWithToken,
  testPg,
  type TestTank,
} from './helpers';

const MIN = 60_000;

async function post(path: string, body: unknown, headers: Record<string, string> = {}): Promise<Response> {
  return fetch(`${baseUrl()}${path}`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', origin: baseUrl(), ...headers },
    body: typeof body === 'string' ? body : JSON.stringify(body),
  });
}

describe('POST /api/ingest', () => {
  let db: pg.Pool;
  let tank: TestTank;
  let other: TestTank;
  let third: TestTank;
  const bearer = (t: { token: string }) => ({ authorization: `Bearer ${t.token}` });

  beforeAll(async () => {
    db = testPg();
    tank = await tankWithToken(db, 170);
    other = await tankWithToken(db, 171);
    third = await tankWithToken(db, 172);
    await clearTelemetry(db, [tank.id, other.id, third.id]);
  });
  afterAll(() => db?.end());

  it('answers 401 without a token and with a wrong one', async () => {
    const none = await post('/api/ingest', reading(tank, Date.now() - MIN));
    expect(none.status).toBe(401);
    expect((await none.json()).error.code).toBe('DeviceTokenRequired');
    const wrong = await post('/api/ingest', reading(tank, Date.now() - MIN), {
      authorization: 'Bearer hldt_not-a-token',
    });
    expect(wrong.status).toBe(401);
    expect((await wrong.json()).error.code).toBe('DeviceTokenInvalid');
  });

  it('accepts a reading and a batch with counts, and counts a replayed batch as duplicates', async () => {
    const t0 = Math.floor(Date.now() / MIN) * MIN - 200 * MIN;
    const one = await post('/api/ingest', reading(tank, t0), bearer(tank));
    expect(one.status).toBe(202);
    expect(await one.json()).toMatchObject({ accepted: 1, duplicate: 0, rejected: 0 });
    const batch = {
      readings: [
        ...Array.from({ length: 5 }, (_, i) => reading(tank, t0 + (i + 1) * MIN)),
        { ts: t0 + 9 * MIN, layersC: 'warm' },
      ],
    };
    const first = await post('/api/ingest', batch, bearer(tank));
    expect(first.status).toBe(202);
    const body = await first.json();
    expect(body).toMatchObject({ accepted: 5, duplicate: 0, rejected: 1 });
    expect(body.rejections[0]).toMatchObject({
      index: 5,
      code: 'InvalidReading',
      fields: [{ field: 'readings[5].layersC' }],
    });
    const again = await post('/api/ingest', batch, bearer(tank));
    expect(await again.json()).toMatchObject({ accepted: 0, duplicate: 5, rejected: 1 });
    expect(await count(db, `select count(*) as n from readings where tank_id = $1`, [tank.id])).toBe(6);
    expect(
      await count(db, `select count(*) as n from dead_letters where tank_id = $1 and transport = 'http'`, [tank.id]),
    ).toBe(2);
  });

  it('is served by the ingest tier on its own port, the web passing its answers through', async () => {
    const ingest = `http://127.0.0.1:${process.env.INGEST_PORT}`;
    const t0 = Math.floor(Date.now() / MIN) * MIN - 600 * MIN;
    const direct = await fetch(`${ingest}/api/ingest`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', ...bearer(third) },
      body: JSON.stringify(reading(third, t0)),
    });
    expect(direct.status).toBe(202);
    expect(await direct.json()).toMatchObject({ accepted: 1, duplicate: 0 });
    expect([direct.headers.get('x-content-type-options'), direct.headers.get('content-security-policy')]).toEqual([
      'nosniff',
      "default-src 'none'; frame-ancestors 'none'; base-uri 'none'; form-action 'none'",
    ]);
    const viaWeb = await post('/api/ingest', reading(third, t0), bearer(third));
    expect(await viaWeb.json()).toMatchObject({ accepted: 0, duplicate: 1 });
    expect(await count(db, `select count(*) as n from readings where tank_id = $1`, [third.id])).toBe(1);
    const noToken = await fetch(`${ingest}/api/ingest`, { method: 'POST', body: '{}' });
    expect([noToken.status, (await noToken.json()).error.code]).toEqual([401, 'DeviceTokenRequired']);
    expect((await fetch(`${ingest}/api/ingest`)).status).toBe(405);
    expect((await fetch(`${ingest}/api/tanks`)).status).toBe(404);
  });

  it('stores only the new readings of a batch that overlaps what is stored and repeats a reading', async () => {
    const t0 = Math.floor(Date.now() / MIN) * MIN - 400 * MIN;
    const first = await post(
      '/api/ingest',
      { readings: [0, 1, 2].map((i) => reading(third, t0 + i * MIN)) },
      bearer(third),
    );
    expect(await first.json()).toMatchObject({ accepted: 3, duplicate: 0 });
    // Readings 1 and 2 are stored already, 3 comes twice, 4 is new: two new, three duplicates.
    const mixed = await post(
      '/api/ingest',
      { readings: [1, 2, 3, 3, 4].map((i) => reading(third, t0 + i * MIN)) },
      bearer(third),
    );
    expect(await mixed.json()).toMatchObject({ accepted: 2, duplicate: 3, rejected: 0 });
    expect(
      await count(db, `select count(*) as n from readings where tank_id = $1 and ts >= $2`, [
        third.id,
        new Date(t0).toISOString(),
      ]),
    ).toBe(5);
    const latest = await db.query(`select ts from tank_latest_state where tank_id = $1`, [third.id]);
    expect(new Date(latest.rows[0].ts).getTime()).toBe(t0 + 4 * MIN);
    // The 15-minute bucket of the new readings is queued for its rollup, or rolled up already by
    // the ingest worker's job (which takes the queue entry in the same transaction).
    const bucket = new Date(Math.floor((t0 + 4 * MIN) / (15 * MIN)) * 15 * MIN).toISOString();
    expect(
      await count(
        db,
        `select (select count(*) from rollup_dirty where tank_id = $1 and bucket = $2)
      + (select count(*) from rollups_15m where tank_id = $1 and bucket = $2) as n`,
        [third.id, bucket],
      ),
    ).toBe(1);
  });

  it('answers 400 naming the field for a malformed body, and dead-letters it', async () => {
    const bad = await post('/api/ingest', '{"ts": ', bearer(tank));
    expect(bad.status).toBe(400);
    expect((await bad.json()).error).toMatchObject({ code: 'InvalidJson', fields: [{ field: '(body)' }] });
    const hot = await post('/api/ingest', reading(tank, Date.now() - MIN, { flowC: 300 }), bearer(tank));
    expect(hot.status).toBe(400);
    expect((await hot.json()).error).toMatchObject({ code: 'InvalidReading', fields: [{ field: 'flowC' }] });
    const letters = await db.query(
      `select reason_code from dead_letters where tank_id = $1 and reason_code in ('InvalidJson', 'InvalidReading') and transport = 'http'`,
      [tank.id],
    );
    expect(letters.rows.map((r) => r.reason_code)).toEqual(expect.arrayContaining(['InvalidJson', 'InvalidReading']));
  });

  it("answers 403 when the body names another tank than the token's", async () => {
    const res = await post(
      '/api/ingest',
      { serial: other.serial, readings: [reading(other, Date.now() - MIN)] },
      bearer(tank),
    );
    expect(res.status).toBe(403);
    expect((await res.json()).error.code).toBe('SerialMismatch');
    expect(await count(db, `select count(*) as n from readings where tank_id = $1`, [other.id])).toBe(0);
  });

  it('answers 413 for a batch over the limit and for a body over the size limit', async () => {
    const many = {
      readings: Array.from({ length: limits.maxBatch + 1 }, (_, i) => reading(tank, Date.now() - (2000 + i) * MIN)),
    };
    const res = await post('/api/ingest', many, bearer(tank));
    expect(res.status).toBe(413);
    expect((await res.json()).error.code).toBe('BatchTooLarge');
    const huge = await post(
      '/api/ingest',
      JSON.stringify({ readings: [], pad: 'x'.repeat(limits.maxPayloadBytes) }),
      bearer(tank),
    );
    expect(huge.status).toBe(413);
    expect((await huge.json()).error.code).toBe('PayloadTooLarge');
    // The same at the ingest tier's own port, also when the body comes in chunks with no length given.
    const ingest = `http://127.0.0.1:${process.env.INGEST_PORT}/api/ingest`;
    const pad = new TextEncoder().encode('x'.repeat(64 * 1024));
    const chunks = new ReadableStream<Uint8Array>({
      start(c) {
        c.enqueue(new TextEncoder().encode('{"readings":[],"pad":"'));
        for (let i = 0; i < 20; i++) c.enqueue(pad);
        c.enqueue(new TextEncoder().encode('"}'));
        c.close();
      },
    });
    const chunked = await fetch(ingest, {
      method: 'POST',
      headers: { 'content-type': 'application/json', ...bearer(tank) },
      body: chunks,
      duplex: 'half',
    } as RequestInit);
    expect(chunked.status).toBe(413);
    expect((await chunked.json()).error.code).toBe('PayloadTooLarge');
  });
});

describe('POST /api/tanks/{id}/device-token', () => {
  let db: pg.Pool;
  let tank: TestTank;
  beforeAll(async () => {
    db = testPg();
    tank = await tankWithToken(db, 172);
  });
  afterAll(() => db?.end());

  it('is for admins only, and a tank of another company is not found', async () => {
    const engineer = await signInAs(baseUrl(), 'engineer');
    expect((await post(`/api/tanks/${tank.id}/device-token`, {}, { cookie: engineer })).status).toBe(403);
    const foreign = await signInAs(baseUrl(), 'admin', 'orrin-bay');
    expect((await post(`/api/tanks/${tank.id}/device-token`, {}, { cookie: foreign })).status).toBe(404);
  });

  it('issues a new token once: it works, the old one no longer does, and the rotation is audited', async () => {
    const admin = await signInAs(baseUrl(), 'admin');
    const res = await post(`/api/tanks/${tank.id}/device-token`, {}, { cookie: admin });
    expect(res.status).toBe(201);
    const body = await res.json();
    expect(body.serial).toBe(tank.serial);
    expect(body.token).toMatch(/^hldt_[A-Za-z0-9_-]{43}$/); // 32 random bytes, base64url
    const stored = await db.query(`select device_token_hash from tanks where id = $1`, [tank.id]);
    expect(stored.rows[0].device_token_hash).not.toContain(body.token);
    const ok = await post('/api/ingest', reading(tank, Date.now() - MIN), { authorization: `Bearer ${body.token}` });
    expect(ok.status).toBe(202);
    const old = await post('/api/ingest', reading(tank, Date.now() - 2 * MIN), {
      authorization: `Bearer ${tank.token}`,
    });
    expect(old.status).toBe(401);
    await expect(connectDevice(mqttUrl(), tank)).rejects.toThrow();
    const dev = await connectDevice(mqttUrl(), { serial: tank.serial, token: body.token });
    await dev.endAsync();
    expect(
      await count(db, `select count(*) as n from audit_log where action = 'device_token.rotated' and subject = $1`, [
        `tank:${tank.id}`,
      ]),
    ).toBe(1);
  });
});

describe('/api/tanks/{id}/commands', () => {
  let db: pg.Pool;
  let own: { id: string };
  let elsewhere: TestTank;
  beforeAll(async () => {
    db = testPg();
    // The demo householder lives in the company's first home (scripts/seed.ts).
    own = (await db.query(`select id from tanks where serial = $1`, [demoTanks()[0].serial])).rows[0];
    elsewhere = await tankWithToken(db, 173);
  });
  afterAll(() => db?.end());

  it('lets a householder boost their own tank, records it as sent, audits it and lists it', async () => {
    const householder = await signInAs(baseUrl(), 'householder');
    const res = await post(`/api/tanks/${own.id}/commands`, { kind: 'boost', minutes: 30 }, { cookie: householder });
    expect(res.status).toBe(202);
    const { command } = await res.json();
    expect(command).toMatchObject({ kind: 'boost', state: 'sent', params: { minutes: 30 } });
    const list = await fetch(`${baseUrl()}/api/tanks/${own.id}/commands`, { headers: { cookie: householder } });
    expect((await list.json()).commands.map((c: { id: string }) => c.id)).toContain(command.id);
    expect(
      await count(
        db,
        `select count(*) as n from audit_log where action = 'command.sent' and detail->>'commandId' = $1`,
        [command.id],
      ),
    ).toBe(1);
  });

  it("keeps the storage target for staff, hides other homes' tanks, and names bad fields", async () => {
    const householder = await signInAs(baseUrl(), 'householder');
    const target = await post(
      `/api/tanks/${own.id}/commands`,
      { kind: 'set_target', targetC: 55 },
      { cookie: householder },
    );
    expect(target.status).toBe(403);
    expect(
      (await post(`/api/tanks/${elsewhere.id}/commands`, { kind: 'boost', minutes: 30 }, { cookie: householder }))
        .status,
    ).toBe(404);
    const engineer = await signInAs(baseUrl(), 'engineer');
    const bad = await post(
      `/api/tanks/${elsewhere.id}/commands`,
      { kind: 'boost', minutes: 5000 },
      { cookie: engineer },
    );
    expect(bad.status).toBe(400);
    expect((await bad.json()).error.fields[0].field).toBe('minutes');
    const low = await post(
      `/api/tanks/${elsewhere.id}/commands`,
      { kind: 'set_target', targetC: 50 },
      { cookie: engineer },
    );
    expect(low.status).toBe(202);
    // HSE HSG274 Part 2: stored hot water at 60 °C or above, so a lower target carries a caution.
    expect((await low.json()).warnings[0]).toMatch(/60 °C/);
  });
});
