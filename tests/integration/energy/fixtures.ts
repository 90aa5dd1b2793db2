// Homes and tanks of their own for the energy tests, with readings, latest state and tariffs
// written straight into the product's tables, so that every figure can be worked by hand.
import { randomUUID } from 'node:crypto';
import { hash } from '@node-rs/argon2';
import { query } from '../../support/db';
import { signIn } from '../../support/session';
import { companyId } from '../../support/accounts';
import type { DemoCompanySlug } from '../../support/session';
import { localDayBounds } from '../../../src/lib/energy';

export interface EnergyTank {
  id: string;
  serial: string;
  homeId: string;
  companyId: string;
}

const made: EnergyTank[] = [];

/** A home (3 occupants) with one 210 L, 4-sensor cylinder whose declared standing loss gives UA = `declaredLossW` / 45 K. */
export async function makeTank(
  company: DemoCompanySlug,
  opts: { declaredLossW?: number; heatSource?: string } = {},
): Promise<EnergyTank> {
  const cid = await companyId(company);
  const tag = `EN${randomUUID().slice(0, 8).toUpperCase()}`;
  const [home] = await query<{ id: string }>(
    `insert into homes (company_id, reference, address_line, town, postcode, occupants) values ($1, $2, '1 Test Lane', 'Cobbmere', 'WM9 9ZZ', 3) returning id`,
    [cid, `${tag}-H`],
  );
  const [tank] = await query<{ id: string }>(
    `insert into tanks (company_id, home_id, serial, model, volume_l, height_m, sensor_count, heat_source, hp_output_w, immersion_w, declared_loss_w, target_c, hysteresis_k, commissioned_at)
     values ($1, $2, $3, 'C210 cylinder', 210, 1.4, 4, $4, 5000, 3000, $5, 55, 5, now() - interval '30 days') returning id`,
    [cid, home!.id, tag, opts.heatSource ?? 'hp_plate', opts.declaredLossW ?? 45],
  );
  const t = { id: tank!.id, serial: tag, homeId: home!.id, companyId: cid };
  made.push(t);
  return t;
}

/** The tank's newest reading as the pipeline keeps it (layers in °C, bottom to top). */
export async function setLatest(t: EnergyTank, layersC: number[]): Promise<void> {
  await query(
    `insert into tank_latest_state (tank_id, ts, last_seen_at, layers_cc, compressor, immersion_w, power_w, draw_dlpm, online)
     values ($1, now(), now(), $2, false, 0, 0, 0, true)
     on conflict (tank_id) do update set layers_cc = excluded.layers_cc, ts = excluded.ts`,
    [t.id, layersC.map((c) => Math.round(c * 100))],
  );
}

/** A home tariff stored directly (already in the energy core's normalised form). */
export async function setHomeTariff(
  t: EnergyTank,
  tariff: { kind: string; validFromMs: number; validToMs: number | null } & Record<string, unknown>,
): Promise<void> {
  await query(
    `insert into tariffs (company_id, home_id, kind, valid_from, valid_to, prices) values ($1, $2, $3, $4, $5, $6)`,
    [
      t.companyId,
      t.homeId,
      tariff.kind,
      new Date(tariff.validFromMs),
      tariff.validToMs === null ? null : new Date(tariff.validToMs),
      JSON.stringify(tariff),
    ],
  );
}

/**
 * One reading a minute for the whole local day `date` plus the next midnight's, layers held at
 * 20/40/50/60 °C: compressor at 1000 W from 01:00 to 02:00, immersion at 3000 W from 18:00 to
 * 18:30, a draw of 10 L/min from 19:00 to 19:05 (local times).
 */
export async function writeHandWorkedDay(t: EnergyTank, date: string): Promise<void> {
  const { startMs, endMs } = localDayBounds(date, 'Europe/London');
  await query(
    `insert into readings (tank_id, ts, layers_cc, compressor, immersion_w, power_w, draw_dlpm)
     select $1, $2::timestamptz + make_interval(mins => m), array[2000, 4000, 5000, 6000]::smallint[],
            m >= 60 and m < 120,
            case when m >= 1080 and m < 1110 then 3000 else 0 end,
            case when m >= 60 and m < 120 then 1000 when m >= 1080 and m < 1110 then 3000 else 0 end,
            case when m >= 1140 and m < 1145 then 100 else 0 end
     from generate_series(0, (extract(epoch from ($3::timestamptz - $2::timestamptz)) / 60)::int) as m`,
    [t.id, new Date(startMs), new Date(endMs)],
  );
}

/**
 * On top of {@link writeHandWorkedDay}: from 12:00 to 13:00 local the immersion takes 2000 W while the
 * solar surplus is 1500 W, so 1.5 kWh of its heat is free and 0.5 kWh comes from the grid.
 */
export async function addSolarHour(t: EnergyTank, date: string): Promise<void> {
  const { startMs } = localDayBounds(date, 'Europe/London');
  await query(
    `update readings set immersion_w = 2000, power_w = 2000, solar_surplus_w = 1500
     where tank_id = $1 and ts >= $2 and ts < $3`,
    [t.id, new Date(startMs + 12 * 3_600_000), new Date(startMs + 13 * 3_600_000)],
  );
}

export async function dropTanks(): Promise<void> {
  const ids = made.map((t) => t.id);
  await query('delete from readings where tank_id = any($1::uuid[])', [ids]);
  await query('delete from tanks where id = any($1::uuid[])', [ids]);
  await query('delete from homes where id = any($1::uuid[])', [made.map((t) => t.homeId)]);
  made.length = 0;
}

export const base = (): string => process.env.TEST_BASE_URL!;

export async function call(
  cookie: string,
  method: string,
  path: string,
  body?: unknown,
  contentType = 'application/json',
): Promise<{ status: number; body: any }> {
  const res = await fetch(`${base()}${path}`, {
    method,
    headers: { cookie, origin: base(), ...(body !== undefined ? { 'content-type': contentType } : {}) },
    ...(body !== undefined ? { body: typeof body === 'string' ? body : JSON.stringify(body) } : {}),
  });
  const text = await res.text();
  return { status: res.status, body: text ? JSON.parse(text) : null };
}

/** A company of its own (invented, example.com), so that its fleet figures and defaults touch nobody else's. */
export async function ownCompany(name: string): Promise<{ id: string; tag: string; domain: string }> {
  const tag = randomUUID().slice(0, 8);
  const domain = `${name.toLowerCase()}.example.com`;
  const [c] = await query<{ id: string }>(
    `insert into companies (slug, name, email_domain) values ($1, $2, $3) returning id`,
    [`${name.toLowerCase()}-${tag}`, `${name} Heating ${tag}`, domain],
  );
  return { id: c!.id, tag, domain };
}

/** A member of that company with a password, signed in: the session cookie. */
export async function staffOf(company: { id: string; tag: string; domain: string }, role: string): Promise<string> {
  const email = `${role}-${company.tag}@${company.domain}`;
  const [u] = await query<{ id: string }>(
    `insert into "user" (id, email, name, password_hash, "emailVerified") values ($1, $2, $3, $4, now()) returning id`,
    [randomUUID(), email, `Test ${role}`, await hash('energy-test-password')],
  );
  await query('insert into memberships (user_id, company_id, role) values ($1, $2, $3)', [u!.id, company.id, role]);
  return signIn(base(), email, 'energy-test-password');
}

/**
 * A home with one tank in `companyId`, and one stored day (energy_days) per entry: `litres` at 40 °C
 * drawn, `cost` pence, heat-pump `hpElec` kWh making `hpHeat` kWh, 0.5 kWh of solar heat. Returns the tank id.
 */
export async function homeWithDays(
  companyId: string,
  n: number,
  days: { date: string; litres: number; cost: number; hpElec: number; hpHeat: number }[],
  heatSource = 'hp_plate',
): Promise<string> {
  const tag = randomUUID().slice(0, 6).toUpperCase();
  const [home] = await query<{ id: string }>(
    `insert into homes (company_id, reference, address_line, town, postcode, occupants) values ($1, $2, $3, 'Tarnfield', 'WM9 4ZZ', 3) returning id`,
    [companyId, `FH-${n}-${tag}`, `${n} Fen Row`],
  );
  const [tank] = await query<{ id: string }>(
    `insert into tanks (company_id, home_id, serial, model, volume_l, height_m, sensor_count, heat_source, hp_output_w, immersion_w, target_c, hysteresis_k)
     values ($1, $2, $3, 'C210 cylinder', 210, 1.4, 8, $4, 5000, 3000, 55, 5) returning id`,
    [companyId, home!.id, `FH${tag}-${n}`, heatSource],
  );
  for (const d of days) {
    await query(
      `insert into energy_days (tank_id, day, company_id, cost_pence, heat_pump_heat_kwh, heat_pump_electricity_kwh, immersion_grid_heat_kwh,
        immersion_solar_heat_kwh, drawn_litres40, standing_loss_kwh, solar_export_forgone_pence, unpriced_kwh, covered_minutes)
      values ($1, $2, $3, $4, $5, $6, 0, 0.5, $7, 1, 0, 0, 1440)`,
      [tank!.id, d.date, companyId, d.cost, d.hpHeat, d.hpElec, d.litres],
    );
  }
  return tank!.id;
}

/** Removes a company made by {@link ownCompany}, with its homes, tanks, tariffs and stored days. */
export async function dropCompany(companyId: string): Promise<void> {
  await query('delete from readings where tank_id in (select id from tanks where company_id = $1)', [companyId]);
  await query('delete from tanks where company_id = $1', [companyId]);
  await query('delete from companies where id = $1', [companyId]);
}
