// Tanks with known telemetry for the views tests, written straight into the pipeline's tables
// (readings, latest state, events, rollups) so that every figure on screen can be checked exactly.
import { randomUUID } from 'node:crypto';
import { query } from '../../support/db';
import { companyId } from '../../support/accounts';
import type { DemoCompanySlug } from '../../support/session';
import { fmtTime } from '../../../src/lib/alerts/rules/common';
import { columnFigures } from '../../../src/lib/views/layers';

export interface FixtureTank {
  id: string;
  serial: string;
  homeId: string;
}
export interface Fixture {
  prefix: string;
  now: Date;
  healthy: FixtureTank;
  faulty: FixtureTank;
  silent: FixtureTank;
  cycling: FixtureTank;
  leaky: FixtureTank;
}

/** When the leaky tank's heat-loss evidence points (its cooling period began), before the fixture's `now`. */
export const LEAK_EVIDENCE_AGO_MS = 10 * 3_600_000;

/** Layers of the healthy tank at minute m (bottom to top, centi-degrees): sensor 2 follows the clock's minute. */
export const healthyLayersCc = (minuteOfHour: number) => [1500, 3000 + minuteOfHour * 10, 4800, 5500];

async function makeTank(
  cid: string,
  prefix: string,
  name: string,
  town: string,
  heatSource = 'hp_plate',
): Promise<FixtureTank> {
  const serial = `${prefix}-${name}`;
  const [home] = await query<{ id: string }>(
    `insert into homes (company_id, reference, address_line, town, postcode, occupants) values ($1, $2, $3, $4, 'WM9 9ZZ', 3) returning id`,
    [cid, `${prefix}-H-${name}`, `${name} Test Row`, town],
  );
  const [tank] = await query<{ id: string }>(
    `insert into tanks (company_id, home_id, serial, model, volume_l, height_m, sensor_count, heat_source, hp_output_w, immersion_w, declared_loss_w, target_c, hysteresis_k, commissioned_at)
     values ($1, $2, $3, 'C210 cylinder', 210, 1.4, 4, $4, 6000, 3000, 57, 55, 5, now() - interval '100 days') returning id`,
    [cid, home.id, serial, heatSource],
  );
  return { id: tank.id, serial, homeId: home.id };
}

async function latest(
  t: FixtureTank,
  layersCc: (number | null)[],
  seenAt: Date,
  extra: { compressor?: boolean } = {},
): Promise<void> {
  // As the writer stores them: the thermal core's figures and their quality.
  const f = columnFigures(
    layersCc.map((c) => (c === null ? null : c / 100)),
    { volumeL: 210, heightM: 1.4, targetC: 55, sensorCount: 4 },
  );
  await query(
    `insert into tank_latest_state (tank_id, ts, last_seen_at, layers_cc, compressor, immersion_w, power_w, draw_dlpm, soc, v40_l, figures_quality, online)
     values ($1, $2, $2, $3, $4, 0, 0, 0, $5, $6, $7, true)`,
    [
      t.id,
      seenAt,
      layersCc,
      extra.compressor ?? false,
      f?.soc ?? null,
      f?.v40L ?? null,
      f ? JSON.stringify(f.quality) : null,
    ],
  );
}

/**
 * Five tanks in `company`: healthy (2 days of readings, a week of rollups), faulty sensor, silent,
 * short-cycling, and one losing heat faster than declared (an alert kind with no figure of its own).
 */
export async function createFixture(company: DemoCompanySlug = 'kestrel-vale', town = 'Tarnfield'): Promise<Fixture> {
  const cid = await companyId(company);
  const prefix = `VW${randomUUID().slice(0, 6).toUpperCase()}`;
  const [{ now }] = await query<{ now: Date }>(`select date_trunc('minute', now()) as now`);
  const healthy = await makeTank(cid, prefix, 'A', town);
  const faulty = await makeTank(cid, prefix, 'B', town);
  const silent = await makeTank(cid, prefix, 'C', 'Larkholt', 'immersion_only');
  const cycling = await makeTank(cid, prefix, 'D', town);
  const leaky = await makeTank(cid, prefix, 'E', town);

  // Two days of readings a minute apart, the compressor on for the first 10 minutes of each hour.
  await query(
    `insert into readings (tank_id, ts, layers_cc, compressor, immersion_w, draw_dlpm, flow_cc)
     select $1, ts, array[1500, 3000 + extract(minute from ts)::int * 10, 4800, 5500]::smallint[], extract(minute from ts) < 10, 0, 0, 5800
     from generate_series($2::timestamptz - interval '2 days', $2::timestamptz - interval '1 minute', interval '1 minute') as ts`,
    [healthy.id, now],
  );
  // A week of 15-minute rollups and eight days of hourly ones; the top held 61 °C in every hour.
  for (const [table, step, span] of [
    ['rollups_15m', '15 minutes', '7 days'],
    ['rollups_1h', '1 hour', '8 days'],
  ] as const) {
    await query(
      `insert into ${table} (tank_id, bucket, samples, layers_avg_cc, top_min_cc, top_max_cc, flow_avg_cc, compressor_samples, immersion_samples, power_avg_w, draw_avg_lpm)
       select $1, b, 15, array[1600, 3100, 4900, 6150]::smallint[], 6100, 6200, 5800, 5, 0, 900, 0.5
       from generate_series(date_trunc('hour', $2::timestamptz) - interval '${span}', $2::timestamptz - interval '${step}', interval '${step}') as b`,
      [healthy.id, now],
    );
  }
  await latest(
    healthy,
    healthyLayersCc(new Date(now.getTime() - 60_000).getUTCMinutes()),
    new Date(now.getTime() - 60_000),
  );
  await latest(faulty, [1500, null, 4800, 5500], new Date(now.getTime() - 60_000));
  await latest(silent, [1500, 3000, 4800, 5500], new Date(now.getTime() - 2 * 3_600_000));
  await latest(cycling, [1500, 3000, 4800, 5500], new Date(now.getTime() - 60_000), { compressor: true });
  await latest(leaky, [1500, 3000, 4800, 5500], new Date(now.getTime() - 60_000));
  // Compressor runs of the cycling tank: starts 3 h and 2 h 30 min ago (30 min apart: a short cycle).
  for (const [startMin, endMin] of [
    [180, 170],
    [150, 140],
  ]) {
    await query(
      `insert into telemetry_events (tank_id, kind, started_at, ended_at, energy_wh, litres, complete)
       values ($1, 'compressor_run', $2::timestamptz - make_interval(mins => $3), $2::timestamptz - make_interval(mins => $4), 450, 0, true)`,
      [cycling.id, now, startMin, endMin],
    );
  }
  // Draws of the healthy tank in the last day.
  await query(
    `insert into telemetry_events (tank_id, kind, started_at, ended_at, energy_wh, litres, complete) values ($1, 'draw', $2::timestamptz - interval '5 hours', $2::timestamptz - interval '4 hours 52 minutes', 0, 42.5, true)`,
    [healthy.id, now],
  );
  // What needs attention is the alerts the rules raised: these are the ones they raise for these
  // tanks, with evidence worded as the rules word it (src/lib/alerts/rules).
  const ago = (ms: number) => now.getTime() - ms;
  const leakFrom = ago(LEAK_EVIDENCE_AGO_MS);
  const raised: [FixtureTank, string, string, string, number][] = [
    [
      faulty,
      'sensor_fault',
      'warning',
      `Sensor 2 (from the bottom) gives no reading since ${fmtTime(ago(70 * 60_000))}.`,
      ago(60 * 60_000),
    ],
    [
      silent,
      'offline',
      'warning',
      `No reading since ${fmtTime(ago(2 * 3_600_000))} (120 min; the limit is 30 min).`,
      ago(2 * 3_600_000),
    ],
    [
      cycling,
      'short_cycling',
      'warning',
      `3 short cycles in 6 h (1 start less than 60 min after the one before, 2 runs shorter than 10 min), the latest at ${fmtTime(ago(150 * 60_000))}.`,
      ago(150 * 60_000),
    ],
    [
      leaky,
      'heat_loss',
      'info',
      `Cooling curves give a standing loss of 92 W and 95 W at 45 K, more than 50% above the declared 57 W (latest period ${fmtTime(leakFrom)} to ${fmtTime(leakFrom + 5 * 3_600_000)}).`,
      leakFrom,
    ],
  ];
  for (const [t, kind, severity, summary, at] of raised) {
    await query(
      `insert into alerts (company_id, tank_id, kind, severity, state, evidence, opened_at) values ($1, $2, $3, $4, 'open', $5, $6)`,
      [cid, t.id, kind, severity, JSON.stringify({ summary, facts: {}, at }), new Date(at)],
    );
  }
  return { prefix, now, healthy, faulty, silent, cycling, leaky };
}

export async function dropFixture(f: Fixture): Promise<void> {
  const ids = [f.healthy.id, f.faulty.id, f.silent.id, f.cycling.id, f.leaky.id];
  await query('delete from readings where tank_id = any($1::uuid[])', [ids]);
  await query('delete from tanks where id = any($1::uuid[])', [ids]);
  await query('delete from homes where id = any($1::uuid[])', [
    [f.healthy.homeId, f.faulty.homeId, f.silent.homeId, f.cycling.homeId, f.leaky.homeId],
  ]);
}
