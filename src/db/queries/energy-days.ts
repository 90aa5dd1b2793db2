// Named queries of the stored daily energy figures: the energy-day job's queue and writes, and the
// fleet's figures read from them (never from raw readings).
import { sql } from 'drizzle-orm';
import { db, type Tx } from '..';
import type { DayEnergy } from '../../lib/energy';
import type { StoredTariff } from '../../lib/tank-energy/tariff-layers';
import type { EnergyTankFacts } from '../../lib/tank-energy/inputs';
import { heatPumpKinds } from '../../lib/heat-sources';

const heatPumpSql = sql.join(
  heatPumpKinds.map((k) => sql`${k}::heat_source`),
  sql`, `,
);

/**
 * Runs `work` in one transaction on up to `limit` queued hours that started before `beforeMs`,
 * taken off the queue (SKIP LOCKED, so several workers share it). If `work` throws, the hours stay
 * queued. Returns what `work` returns, or null when the queue held nothing due.
 */
export async function withDirtyEnergyHours<T>(
  beforeMs: number,
  limit: number,
  work: (tx: Tx, hours: { tankId: string; hourMs: number }[]) => Promise<T>,
): Promise<T | null> {
  return db().transaction(async (tx) => {
    const taken = await tx.execute<{ tank_id: string; hour_ms: string }>(sql`
      delete from energy_day_dirty where (tank_id, hour) in (
        select tank_id, hour from energy_day_dirty where hour < ${new Date(beforeMs).toISOString()}::timestamptz
        order by tank_id, hour limit ${limit} for update skip locked)
      returning tank_id, (extract(epoch from hour) * 1000)::int8 as hour_ms`);
    if (taken.rows.length === 0) return null;
    return work(
      tx,
      taken.rows.map((r) => ({ tankId: r.tank_id, hourMs: Number(r.hour_ms) })),
    );
  });
}

export type EnergyDayTank = EnergyTankFacts & { id: string; companyId: string; homeId: string | null };

/** What the accounting needs of these tanks (the job's view: no viewer, no scope). */
export async function energyTanksById(tx: Tx, ids: readonly string[]): Promise<EnergyDayTank[]> {
  const res = await tx.execute<{
    id: string;
    company_id: string;
    home_id: string | null;
    volume_l: number;
    height_m: number;
    sensor_count: number;
    heat_source: EnergyTankFacts['heatSource'];
    hp_output_w: number;
    immersion_w: number;
    declared_loss_w: number | null;
    target_c: number;
    sensor_heights_m: number[] | null;
    cold_inlet_c: number | null;
  }>(sql`
    select t.id, t.company_id, t.home_id, t.volume_l, t.height_m, t.sensor_count, t.heat_source, t.hp_output_w, t.immersion_w, t.declared_loss_w, t.target_c,
      t.sensor_heights_m, h.cold_inlet_c
    from tanks t left join homes h on h.id = t.home_id where t.id = any(${`{${ids.join(',')}}`}::uuid[])`);
  return res.rows.map((r) => ({
    id: r.id,
    companyId: r.company_id,
    homeId: r.home_id,
    volumeL: r.volume_l,
    heightM: r.height_m,
    sensorCount: r.sensor_count,
    heatSource: r.heat_source,
    hpOutputW: r.hp_output_w,
    immersionW: r.immersion_w,
    declaredLossW: r.declared_loss_w,
    targetC: r.target_c,
    sensorHeightsM: r.sensor_heights_m,
    coldInletC: r.cold_inlet_c,
  }));
}

/** Every tariff of these companies (defaults and homes' own), for choosing per home. */
export async function tariffsOfCompanies(
  tx: Tx,
  companyIds: readonly string[],
): Promise<(StoredTariff & { companyId: string })[]> {
  const res = await tx.execute<{
    company_id: string;
    home_id: string | null;
    prices: StoredTariff['prices'];
    valid_from: string;
    created_at: string;
  }>(sql`
    select company_id, home_id, prices, valid_from, created_at from tariffs where company_id = any(${`{${companyIds.join(',')}}`}::uuid[])`);
  return res.rows.map((r) => ({
    companyId: r.company_id,
    homeId: r.home_id,
    prices: r.prices,
    validFrom: new Date(r.valid_from),
    createdAt: new Date(r.created_at),
  }));
}

/** A tank's readings in [from, to), oldest first, in the shape the accounting takes. */
export async function energyReadingsIn(tx: Tx, tankId: string, fromMs: number, toMs: number) {
  const res = await tx.execute<{
    ts_ms: string;
    layers_cc: (number | null)[];
    compressor: boolean | null;
    immersion_w: number | null;
    power_w: number | null;
    draw_dlpm: number | null;
    solar_surplus_w: number | null;
  }>(sql`
    select (extract(epoch from ts) * 1000)::int8 as ts_ms, layers_cc, compressor, immersion_w, power_w, draw_dlpm, solar_surplus_w
    from readings where tank_id = ${tankId} and ts >= ${new Date(fromMs).toISOString()}::timestamptz and ts < ${new Date(toMs).toISOString()}::timestamptz
    order by ts`);
  return res.rows.map((r) => ({
    ts: new Date(Number(r.ts_ms)),
    layersCc: r.layers_cc,
    compressor: r.compressor,
    immersionW: r.immersion_w,
    powerW: r.power_w,
    drawDlpm: r.draw_dlpm,
    solarSurplusW: r.solar_surplus_w,
  }));
}

/** Stores one tank-day's figures (replacing what was there), or removes the day when `day` is null (no readings left). */
export async function saveEnergyDay(
  tx: Tx,
  tank: { id: string; companyId: string },
  date: string,
  day: DayEnergy | null,
): Promise<void> {
  if (!day) {
    await tx.execute(sql`delete from energy_days where tank_id = ${tank.id} and day = ${date}::date`);
    return;
  }
  await tx.execute(sql`
    insert into energy_days (tank_id, day, company_id, cost_pence, heat_pump_heat_kwh, heat_pump_electricity_kwh, immersion_grid_heat_kwh,
      immersion_solar_heat_kwh, drawn_litres40, standing_loss_kwh, solar_export_forgone_pence, unpriced_kwh, covered_minutes, computed_at)
    values (${tank.id}, ${date}::date, ${tank.companyId}, ${day.costPence}, ${day.heatPumpHeatKWh}, ${day.heatPumpElectricityKWh}, ${day.immersionGridHeatKWh},
      ${day.immersionSolarHeatKWh}, ${day.drawnLitres40}, ${day.standingLossKWh}, ${day.solarExportForgonePence}, ${day.unpricedKWh}, ${day.coveredMinutes}, now())
    on conflict (tank_id, day) do update set company_id = excluded.company_id, cost_pence = excluded.cost_pence,
      heat_pump_heat_kwh = excluded.heat_pump_heat_kwh, heat_pump_electricity_kwh = excluded.heat_pump_electricity_kwh,
      immersion_grid_heat_kwh = excluded.immersion_grid_heat_kwh, immersion_solar_heat_kwh = excluded.immersion_solar_heat_kwh,
      drawn_litres40 = excluded.drawn_litres40, standing_loss_kwh = excluded.standing_loss_kwh,
      solar_export_forgone_pence = excluded.solar_export_forgone_pence, unpriced_kwh = excluded.unpriced_kwh,
      covered_minutes = excluded.covered_minutes, computed_at = now()`);
}

/**
 * Queues the stored days a new tariff may price differently: the home's (or, for a company
 * default, every home's) days from the local day before its start to the day after its end.
 * Each day is queued by its local noon, in `timeZone`.
 */
export async function queueDaysForTariff(input: {
  companyId: string;
  homeId: string | null;
  validFromMs: number;
  validToMs: number | null;
  timeZone: string;
}): Promise<void> {
  const to = input.validToMs === null ? null : new Date(input.validToMs + 86_400_000).toISOString();
  await db().execute(sql`
    insert into energy_day_dirty (tank_id, hour)
    select e.tank_id, (e.day::timestamp + interval '12 hours') at time zone ${input.timeZone}
    from energy_days e join tanks t on t.id = e.tank_id
    where e.company_id = ${input.companyId}
      and (${input.homeId}::uuid is null or t.home_id = ${input.homeId}::uuid)
      and e.day >= (${new Date(input.validFromMs - 86_400_000).toISOString()}::timestamptz at time zone ${input.timeZone})::date
      and (${to}::timestamptz is null or e.day <= (${to}::timestamptz at time zone ${input.timeZone})::date)
    order by 1, 2
    on conflict do nothing`);
}

/** Drops stored days older than `keepDays` (the fleet compares at most a year). */
export async function pruneEnergyDays(keepDays: number): Promise<void> {
  await db().execute(sql`delete from energy_days where day < current_date - ${keepDays}::int`);
}

export interface FleetEnergyRule {
  minDays: number;
  minLitres40PerDay: number;
  minHeatPumpKWhPerDay: number;
  k: number;
  minHomes: number;
  maxListed: number;
}

type FleetEnergyRow = {
  summary: {
    homes: number;
    home_days: number | null;
    cost: number | null;
    litres: number | null;
    hp_heat: number | null;
    hp_elec: number | null;
    solar: number | null;
    unpriced: number | null;
    n_cpl: number;
    q_cpl: [number, number, number] | null;
    n_cop: number;
    q_cop: [number, number, number] | null;
  };
  outliers:
    | {
        tank_id: string;
        serial: string;
        reference: string | null;
        town: string | null;
        metric: 'cost_per_100l' | 'dhw_cop';
        value: number;
        side: 'high' | 'low';
        beyond_iqr: number | null;
        days: number;
      }[]
    | null;
};

/**
 * A company's energy over local dates [from, to] from the stored days, in one statement: each
 * home's totals, the fleet's totals, the quartiles of each home's cost per 100 L at 40 °C and of its
 * DHW COP (percentile_cont), and the homes outside Tukey's fences of each (`rule`, see
 * src/lib/tank-energy/fleet-outliers.ts). It reads one row per tank-day through the
 * (company_id, day) index, never readings.
 */
export async function fleetEnergyFigures(
  companyId: string,
  from: string,
  to: string,
  rule: FleetEnergyRule,
): Promise<FleetEnergyRow> {
  return db().transaction(async (tx) => {
    // Summing 50,000 homes in memory takes about 15 MB; PostgreSQL's default 4 MB would sort instead.
    await tx.execute(sql`set local work_mem = '64MB'`);
    const res = await tx.execute<FleetEnergyRow>(sql`
    with per_home as (
      select tank_id, count(*)::int as days, sum(cost_pence) as cost, sum(drawn_litres40) as litres,
        sum(heat_pump_heat_kwh) as hp_heat, sum(heat_pump_electricity_kwh) as hp_elec,
        sum(immersion_solar_heat_kwh) as solar, sum(unpriced_kwh) as unpriced
      from energy_days
      where company_id = ${companyId} and day between ${from}::date and ${to}::date
      group by tank_id
    ), m as (
      -- Cost per litre is compared among heat-pump homes only: a cylinder heated by its immersion
      -- alone costs two to three times as much per litre by design, and would swamp the fences; a
      -- boiler's fuel is not in the electricity cost at all.
      select per_home.*,
        case when days >= ${rule.minDays}::int and litres >= ${rule.minLitres40PerDay}::float8 * days and t.heat_source in (${heatPumpSql}) then 100 * cost / litres end as cpl,
        case when days >= ${rule.minDays}::int and hp_elec >= ${rule.minHeatPumpKWhPerDay}::float8 * days then hp_heat / hp_elec end as cop
      from per_home join tanks t on t.id = per_home.tank_id
    ), f as (
      select count(*)::int as homes, sum(days)::int as home_days, sum(cost) as cost, sum(litres) as litres, sum(hp_heat) as hp_heat,
        sum(hp_elec) as hp_elec, sum(solar) as solar, sum(unpriced) as unpriced,
        count(cpl)::int as n_cpl, percentile_cont(array[0.25, 0.5, 0.75]) within group (order by cpl) as q_cpl,
        count(cop)::int as n_cop, percentile_cont(array[0.25, 0.5, 0.75]) within group (order by cop) as q_cop
      from m
    ), fences as (
      select 'cost_per_100l'::text as metric, q_cpl[1] as q1, q_cpl[3] as q3, q_cpl[3] - q_cpl[1] as iqr from f where n_cpl >= ${rule.minHomes}::int
      union all
      select 'dhw_cop', q_cop[1], q_cop[3], q_cop[3] - q_cop[1] from f where n_cop >= ${rule.minHomes}::int
    ), v as (
      select m.tank_id, m.days, x.metric, x.value from m
      cross join lateral (values ('cost_per_100l'::text, m.cpl), ('dhw_cop', m.cop)) as x(metric, value)
      where x.value is not null
    ), o as (
      select v.*, case when v.value > fe.q3 + ${rule.k}::float8 * fe.iqr then 'high' else 'low' end as side,
        case when v.value > fe.q3 then (v.value - fe.q3) / nullif(fe.iqr, 0) else (fe.q1 - v.value) / nullif(fe.iqr, 0) end - ${rule.k}::float8 as beyond_iqr,
        row_number() over (partition by v.metric order by abs(case when v.value > fe.q3 then v.value - fe.q3 else fe.q1 - v.value end) desc) as rank
      from v join fences fe using (metric)
      where v.value > fe.q3 + ${rule.k}::float8 * fe.iqr or v.value < fe.q1 - ${rule.k}::float8 * fe.iqr
    )
    select (select row_to_json(f) from f) as summary,
      (select json_agg(json_build_object('tank_id', o.tank_id, 'serial', t.serial, 'reference', h.reference, 'town', h.town, 'metric', o.metric,
          'value', o.value, 'side', o.side, 'beyond_iqr', o.beyond_iqr, 'days', o.days) order by o.metric, o.rank)
        from o join tanks t on t.id = o.tank_id left join homes h on h.id = t.home_id
        where o.rank <= ${rule.maxListed}::int) as outliers`);
    return res.rows[0]!;
  });
}
