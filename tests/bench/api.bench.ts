// `npm run bench:api`: seeds a 50,000-tank company in a throwaway PostgreSQL and prints p50/p95 and
// answer sizes of the tank list (GET /api/tanks) and of a 7-day readings call, measured on the
// handlers' query and shaping code (no HTTP, no sign-in), plus the fleet summary computed cold, and
// the gzipped JavaScript each page sends (its islands), from the production build.
// Figures only: nothing here passes or fails. BENCH_KEEP=1 leaves the database running afterwards
// (the command to reach it is printed) for EXPLAIN ANALYZE on the same data.
import { loadavg } from 'node:os';
import { gzipSync } from 'node:zlib';
import { buildDir, ensureBuild } from '../../scripts/lib/build';
import { pageScriptSizes } from '../../scripts/lib/island-sizes';
import { memoFigures } from '../../src/lib/views/figures-memo';
import { benchPort, pct, seedBenchCompany, withBenchDatabase } from './fleet-database';

const TANKS = Number(process.env.BENCH_TANKS ?? 50_000);
const RUNS = Number(process.env.BENCH_RUNS ?? 40);
// Inside the caller's test port block (base + 90), so it can run beside other contributors' tests.
const PORT = benchPort(90);
const KEEP = process.env.BENCH_KEEP === '1';

async function time<T>(fn: () => Promise<T>): Promise<[number, T]> {
  const t = performance.now();
  const r = await fn();
  return [performance.now() - t, r];
}

async function main() {
  await withBenchDatabase(
    PORT,
    async () => {
      const { db, closeDb } = await import('../../src/db');
      const { sql } = await import('drizzle-orm');
      const { listTanks } = await import('../../src/db/queries/tanks');
      const { fleetSummary, clearFleetSummaries } = await import('../../src/db/queries/fleet');
      const { readingsInRange } = await import('../../src/db/queries/readings');
      const { toSeries } = await import('../../src/lib/views/series');
      const { tanksQuerySchema } = await import('../../src/lib/views/contracts');
      const d = db();

      const seedStart = performance.now();
      const companyId = await seedBenchCompany(TANKS);
      await d.execute(sql`
      insert into tanks (company_id, home_id, serial, model, volume_l, height_m, sensor_count, heat_source, hp_output_w)
      select ${companyId}, h.id, 'BN-' || lpad(substr(h.reference, 4), 6, '0'), 'C210 cylinder', 210, 1.4, 12,
        (case when random() < 0.1 then 'immersion_only' else 'hp_plate' end)::heat_source, 6000
      from homes h where h.company_id = ${companyId}`);
      // Latest state: 2 % silent, 1 % with an open sensor, the rest reporting a stratified column. The
      // writer stamps a batch's tanks with one receipt time, so reporting tanks share it in groups:
      // 300 batches over the last minute (about 160 tanks each).
      await d.execute(sql`
      insert into tank_latest_state (tank_id, ts, last_seen_at, layers_cc, soc, v40_l, online, compressor, immersion_w)
      select t.id, now() - interval '1 minute',
        case when random() < 0.02 then now() - interval '3 hours' - random() * interval '2 days' else now() - floor(random() * 300) * interval '200 milliseconds' end,
        case when random() < 0.01 then array[1500,2000,null,3000,3500,4000,4500,5000,5200,5400,5500,5600]::smallint[]
             else array[1500,1800,2200,2800,3500,4200,4800,5100,5300,5400,5500,5600]::smallint[] end,
        random(), 40 + random() * 200, true, false, 0
      from tanks t where t.company_id = ${companyId}`);
      // A day of compressor runs per tank, one start about every 3 h (some tanks every 40 min: short cycles).
      await d.execute(sql`
      insert into telemetry_events (tank_id, kind, started_at, ended_at, energy_wh, complete)
      select t.id, 'compressor_run', now() - (k * case when (hashtext(t.id::text) % 50) = 0 then interval '40 minutes' else interval '3 hours' end),
        now() - (k * case when (hashtext(t.id::text) % 50) = 0 then interval '40 minutes' else interval '3 hours' end) + interval '20 minutes', 500, true
      from tanks t, generate_series(1, 8) k where t.company_id = ${companyId}`);
      // One tank with 7 days of raw readings and 15-minute rollups for the readings call.
      const [{ id: tankId }] = (
        await d.execute<{ id: string }>(
          sql`select id from tanks where company_id = ${companyId} order by serial limit 1`,
        )
      ).rows;
      await d.execute(sql`
      insert into readings (tank_id, ts, layers_cc, compressor, immersion_w, draw_dlpm)
      select ${tankId}, ts, array[1500,1800,2200,2800,3500,4200,4800,5100,5300,5400,5500,5600]::smallint[], extract(minute from ts) < 10, 0, 0
      from generate_series(now() - interval '7 days', now(), interval '1 minute') ts`);
      await d.execute(sql`
      insert into rollups_15m (tank_id, bucket, samples, layers_avg_cc, top_min_cc, top_max_cc, compressor_samples, immersion_samples)
      select ${tankId}, b, 15, array[1500,1800,2200,2800,3500,4200,4800,5100,5300,5400,5500,5600]::smallint[], 5500, 5700, 5, 0
      from generate_series(date_trunc('hour', now()) - interval '7 days', now(), interval '15 minutes') b`);
      // Open alerts as the rules would raise them for those tanks (offline, sensor fault, short-cycling),
      // a few more kinds, and three months of resolved history (two a tank) that the list must skip.
      await d.execute(sql`
      insert into alerts (company_id, tank_id, kind, severity, state, evidence, opened_at)
      select ${companyId}, t.id, k.kind, k.severity, 'open', jsonb_build_object('summary', k.kind::text || ' (bench)', 'facts', '{}'::jsonb, 'at', 0), now() - interval '2 hours'
      from tanks t join tank_latest_state l on l.tank_id = t.id
      cross join lateral (values
        ('offline'::alert_kind, 'warning'::alert_severity, l.last_seen_at < now() - interval '30 minutes'),
        ('sensor_fault', 'warning', array_position(l.layers_cc, null) is not null),
        ('short_cycling', 'warning', hashtext(t.id::text) % 50 = 0 and t.heat_source <> 'immersion_only'),
        ('legionella_risk', 'critical', abs(hashtext(t.id::text)) % 97 = 1),
        ('heat_loss', 'info', abs(hashtext(t.id::text)) % 199 = 2)
      ) as k(kind, severity, raised)
      where t.company_id = ${companyId} and k.raised`);
      await d.execute(sql`
      insert into alerts (company_id, tank_id, kind, severity, state, evidence, opened_at, resolved_at)
      select ${companyId}, t.id, (array['offline','short_cycling']::alert_kind[])[k], 'warning', 'resolved', '{"summary":"(bench)","facts":{},"at":0}'::jsonb,
        now() - make_interval(days => 10 + k * 30), now() - make_interval(days => 9 + k * 30)
      from tanks t, generate_series(1, 2) k where t.company_id = ${companyId}`);
      await d.execute(sql`analyze`);
      const [{ open }] = (
        await d.execute<{ open: number }>(sql`select count(*)::int as open from alerts where state <> 'resolved'`)
      ).rows;
      console.log(
        `seeded ${TANKS.toLocaleString('en-GB')} tanks, ${(8 * TANKS).toLocaleString('en-GB')} compressor runs, ${open.toLocaleString('en-GB')} open alerts (${(2 * TANKS).toLocaleString('en-GB')} resolved) and 7 days of one tank in ${((performance.now() - seedStart) / 1000).toFixed(1)} s`,
      );

      console.log(
        `load average ${loadavg()
          .map((x) => x.toFixed(1))
          .join(' / ')} on a shared machine: read the figures against it`,
      );
      const scope = { companyId, homeIds: null };
      const cold: number[] = [];
      for (let i = 0; i < 5; i++) {
        clearFleetSummaries();
        cold.push((await time(() => fleetSummary(scope)))[0]);
      }
      console.log(
        `GET /api/fleet/summary (cold, every tank's charge): p50 ${pct(cold, 50).toFixed(0)} ms, max ${Math.max(...cold).toFixed(0)} ms — kept 10 s, served stale up to 60 s while it refreshes`,
      );

      const cases: [string, Record<string, string>][] = [
        ['first page, ranked by attention', {}],
        ['page 400 ranked by attention', { page: '400' }],
        ['page 40 by serial', { sort: 'serial', page: '40' }],
        ['filter short-cycling', { alert: 'short_cycling' }],
        ['status offline, by town', { status: 'offline', sort: 'town' }],
        ['free text + town', { q: 'BN-0012', town: 'Larkholt' }],
        ['sort by V40, 100 a page', { sort: 'v40', pageSize: '100' }],
        ['sort by V40, most first', { sort: 'v40', dir: 'desc' }],
        ['last reading, newest first', { sort: 'lastSeen' }],
      ];
      for (const [name, qs] of cases) {
        const q = tanksQuerySchema.parse(qs);
        const ms: number[] = [];
        let bytes = 0;
        let total = 0;
        for (let i = 0; i < RUNS; i++) {
          const [t, body] = await time(async () => JSON.stringify(await listTanks(scope, q)));
          ms.push(t);
          bytes = Buffer.byteLength(body);
          total = JSON.parse(body).total;
        }
        console.log(
          `GET /api/tanks ${name.padEnd(34)} p50 ${pct(ms, 50).toFixed(1).padStart(6)} ms  p95 ${pct(ms, 95).toFixed(1).padStart(6)} ms  ${bytes.toLocaleString('en-GB')} B (${total.toLocaleString('en-GB')} matching)`,
        );
      }
      const tank = {
        id: tankId,
        volumeL: 210,
        heightM: 1.4,
        targetC: 55,
        sensorCount: 12,
        positionsM: Array.from({ length: 12 }, (_, i) => ((i + 0.5) / 12) * 1.4),
      };
      for (const resolution of ['15m', 'raw'] as const) {
        const to = new Date();
        const from = new Date(to.getTime() - 7 * 86_400_000);
        const ms: number[] = [];
        let body = '';
        for (let i = 0; i < Math.min(RUNS, 15); i++) {
          const [t, b] = await time(async () =>
            JSON.stringify(
              toSeries(await readingsInRange(tankId, from, to, resolution), tank, { from, to, resolution }),
            ),
          );
          ms.push(t);
          body = b;
        }
        console.log(
          `GET /api/tanks/{id}/readings 7 days, ${resolution.padEnd(3)}        p50 ${pct(ms, 50).toFixed(1).padStart(6)} ms  p95 ${pct(ms, 95).toFixed(1).padStart(6)} ms  ${Buffer.byteLength(body).toLocaleString('en-GB')} B (${gzipSync(body).length.toLocaleString('en-GB')} B gzipped), ${JSON.parse(body).t.length.toLocaleString('en-GB')} points`,
        );
      }
      {
        // The tank page's live 24-hour window: fetched in full with figures worked out per request,
        // then through the memo (once per reading), then polled with a cursor at its newest point.
        const to = new Date();
        const from = new Date(to.getTime() - 86_400_000);
        const meta = { from, to, resolution: 'raw' as const };
        const rows = await readingsInRange(tankId, from, to, 'raw');
        const since = new Date(rows.at(-1)!.t);
        const runs = Math.min(RUNS, 15);
        const measure = async (label: string, f: () => object) => {
          const ms: number[] = [];
          let body = '';
          for (let i = 0; i < runs; i++) {
            const [t, b] = await time(async () => JSON.stringify(f()));
            ms.push(t);
            body = b;
          }
          console.log(
            `GET /api/tanks/{id}/readings 24 h raw, ${label.padEnd(28)} p50 ${pct(ms, 50).toFixed(1).padStart(6)} ms  p95 ${pct(ms, 95).toFixed(1).padStart(6)} ms  ${Buffer.byteLength(body).toLocaleString('en-GB')} B`,
          );
          return pct(ms, 50);
        };
        const perRequest = await measure('figures per request', () => toSeries(rows, tank, meta));
        memoFigures(tankId, rows, tank);
        const memoised = await measure('figures from the memo', () =>
          toSeries(rows, tank, meta, memoFigures(tankId, rows, tank)),
        );
        const polled = await measure('poll since newest (memo)', () =>
          toSeries(rows, tank, { ...meta, since }, memoFigures(tankId, rows, tank)),
        );
        console.log(
          `  (shaping only, the database read of ${rows.length.toLocaleString('en-GB')} rows aside: memo ${(memoised / perRequest).toFixed(2)}× and poll ${(polled / perRequest).toFixed(2)}× the per-request time)`,
        );
      }
      await closeDb();

      // The JavaScript each page sends (its islands and what they import), from the production build.
      ensureBuild();
      console.log('');
      console.log('Page scripts, gzipped (React islands and their imports, counted once a page):');
      // Budgets (common practice for pages used on phones over mobile data): the householder's page
      // and the tank page; React 19's renderer alone is about 65 kB of them.
      const budgetsKb: Record<string, number> = { '/home': 80, '/tanks/[id]': 120 };
      for (const p of pageScriptSizes(buildDir()).filter((x) => x.files > 0)) {
        const kb = p.gzipBytes / 1024;
        const budget = budgetsKb[p.page];
        const verdict =
          budget === undefined
            ? ''
            : `  budget ${budget} kB: ${kb <= budget ? 'within' : `over by ${(kb - budget).toFixed(1)} kB`} (ratio ${(kb / budget).toFixed(2)})`;
        console.log(
          `  ${p.page.padEnd(26)} ${kb.toFixed(1).padStart(6)} kB in ${String(p.files).padStart(2)} files (${(p.bytes / 1024).toFixed(0)} kB raw)  ${p.islands.join(', ')}${verdict}`,
        );
      }
    },
    KEEP,
  );
}

main().catch((err) => {
  console.error(err);
  process.exitCode = 1;
});
