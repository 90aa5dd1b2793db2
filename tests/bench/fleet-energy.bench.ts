// `npm run bench:fleet-energy`: a 50,000-home company with 30 stored days each (1.5 million
// energy_days rows) in a throwaway PostgreSQL, and the p50/p95 of the desk's fleet energy figures
// (GET /api/fleet/energy's query and shaping, no HTTP) over 7, 30 and 90 days; plus the energy-day
// job accounting one day of minute readings for 200 tanks. Figures only: nothing passes or fails.
import { loadavg } from 'node:os';
import { benchPort, pct, seedBenchCompany, withBenchDatabase } from './fleet-database';

const HOMES = Number(process.env.BENCH_HOMES ?? 50_000);
const DAYS = 30;
const RUNS = Number(process.env.BENCH_RUNS ?? 15);
const JOB_TANKS = 200;
// Inside the caller's test port block (base + 96), so it can run beside other contributors' tests.
const PORT = benchPort(96);

async function main() {
  await withBenchDatabase(PORT, async () => {
    const { db, closeDb } = await import('../../src/db');
    const { sql } = await import('drizzle-orm');
    const { fleetEnergy } = await import('../../src/lib/tank-energy/energy.server');
    const { refreshEnergyDays } = await import('../../src/lib/tank-energy/energy-days.server');
    const d = db();

    const seedStart = performance.now();
    const companyId = await seedBenchCompany(HOMES);
    await d.execute(sql`
      insert into tanks (company_id, home_id, serial, model, volume_l, height_m, sensor_count, heat_source, hp_output_w, immersion_w, declared_loss_w, target_c, hysteresis_k)
      select ${companyId}, h.id, 'BT' || h.reference, 'C210 cylinder', 210, 1.4, 8, 'hp_plate', 6000, 3000, 60, 55, 5 from homes h where h.company_id = ${companyId}`);
    // Invented, spread figures: about 40 p and 100–200 L at 40 °C a day, DHW COP around 2.8, a few odd homes.
    await d.execute(sql`
      insert into energy_days (tank_id, day, company_id, cost_pence, heat_pump_heat_kwh, heat_pump_electricity_kwh, immersion_grid_heat_kwh,
        immersion_solar_heat_kwh, drawn_litres40, standing_loss_kwh, solar_export_forgone_pence, unpriced_kwh, covered_minutes)
      select t.id, current_date - g, ${companyId}, 30 + 20 * random() + case when hashtext(t.id::text) % 97 = 0 then 60 else 0 end,
        3 + random(), 1.1 + 0.2 * random(), 0.2 * random(), 0.5 * random(), 100 + 100 * random(), 1.2, 0, 0, 1440
      from tanks t cross join generate_series(1, ${DAYS}) g where t.company_id = ${companyId}`);
    // As autovacuum leaves an insert-mostly table: visible to index-only scans.
    await d.execute(sql`vacuum analyze energy_days`);
    const seedS = (performance.now() - seedStart) / 1000;

    const scope = { companyId, homeIds: null };
    const iso = (daysAgo: number) => new Date(Date.now() - daysAgo * 86_400_000).toISOString().slice(0, 10);
    const lines: string[] = [];
    for (const span of [7, 30, 90]) {
      const times: number[] = [];
      let outliers = 0;
      for (let i = 0; i < RUNS; i++) {
        const t = performance.now();
        const r = await fleetEnergy(scope, { from: iso(span), to: iso(1) });
        times.push(performance.now() - t);
        outliers = r.outliers.length;
      }
      lines.push(
        `  ${String(span).padStart(2)} days: p50 ${pct(times, 50).toFixed(0)} ms, p95 ${pct(times, 95).toFixed(0)} ms (${Math.min(span, DAYS) * HOMES} stored days read, ${outliers} outliers listed)`,
      );
    }

    // The job: one local day of minute readings for JOB_TANKS tanks, queued as their hours.
    const day = new Date(Date.now() - 2 * 86_400_000);
    day.setUTCHours(0, 0, 0, 0);
    await d.execute(sql`
      insert into readings (tank_id, ts, layers_cc, compressor, immersion_w, power_w, draw_dlpm)
      select t.id, ${day.toISOString()}::timestamptz + make_interval(mins => m), array[2000,3000,4000,4500,5000,5200,5400,5500]::smallint[],
        m % 180 < 30, 0, case when m % 180 < 30 then 1500 else 0 end, case when m % 240 = 0 then 80 else 0 end
      from (select id from tanks where company_id = ${companyId} limit ${JOB_TANKS}) t cross join generate_series(0, 1440) m`);
    await d.execute(
      sql`insert into energy_day_dirty (tank_id, hour) select distinct tank_id, date_trunc('hour', ts) from readings on conflict do nothing`,
    );
    const jobStart = performance.now();
    let written = 0;
    for (;;) {
      const n = await refreshEnergyDays({ limit: 2000 });
      if (n.hours === 0) break;
      written += n.days;
    }
    const jobMs = performance.now() - jobStart;

    console.log(
      `\nFleet energy figures, ${HOMES.toLocaleString('en-GB')} homes × ${DAYS} stored days (seeded in ${seedS.toFixed(0)} s; load ${loadavg()[0]!.toFixed(1)} on this machine)`,
    );
    for (const l of lines) console.log(l);
    console.log(
      `Energy-day job: ${written} tank-days of 1,441 readings each in ${(jobMs / 1000).toFixed(1)} s (${(jobMs / Math.max(1, written)).toFixed(1)} ms a tank-day)`,
    );
    await closeDb();
  });
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
