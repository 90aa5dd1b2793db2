// What the fleet-scale benchmarks share: a throwaway, migrated PostgreSQL in the caller's test port
// block, a company of `homes` invented homes in the demo's towns, and percentiles.
import { defaultDataDir, startPostgres, stopPostgres } from '../../scripts/lib/postgres';
import { testPortBase } from '../../scripts/lib/ports';

/** The p-th percentile (0–100) of `xs`, nearest rank. */
export const pct = (xs: number[], p: number): number => {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.floor((p / 100) * s.length))]!;
};

/** PostgreSQL port: `BENCH_PG_PORT`, else `offset` into the test port block (scripts/lib/ports.ts), beside other test runs. */
export const benchPort = (offset: number): number => Number(process.env.BENCH_PG_PORT ?? testPortBase() + offset);

/**
 * Runs `body` against a fresh, migrated database on `port` (DATABASE_URL set for the app's modules),
 * then stops it, unless `keep` (the command to reach and stop it is printed).
 */
export async function withBenchDatabase(port: number, body: () => Promise<void>, keep = false): Promise<void> {
  const server = await startPostgres({ port, dataDir: defaultDataDir(port, true), fresh: true });
  process.env.DATABASE_URL = server.url;
  try {
    const { runMigrations } = await import('../../scripts/migrate');
    await runMigrations();
    await body();
  } finally {
    if (keep)
      console.log(
        `database kept: psql ${server.url}   (stop: runuser -u postgres -- /usr/lib/postgresql/15/bin/pg_ctl stop -D ${server.dataDir})`,
      );
    else stopPostgres(server.dataDir);
  }
}

/** A bench company with `homes` homes (`BH-1` …); returns its id. */
export async function seedBenchCompany(homes: number): Promise<string> {
  const { db } = await import('../../src/db');
  const { sql } = await import('drizzle-orm');
  const d = db();
  const [{ id: companyId }] = (
    await d.execute<{ id: string }>(
      sql`insert into companies (slug, name, email_domain) values ('bench', 'Bench Fleet', 'bench.example.com') returning id`,
    )
  ).rows;
  await d.execute(sql`
    insert into homes (company_id, reference, address_line, town, postcode)
    select ${companyId}, 'BH-' || g, g || ' Bench Street', (array['Ashby Wend','Larkholt','Cobbmere','Tarnfield'])[1 + g % 4], 'WM1 1AA'
    from generate_series(1, ${homes}) g`);
  return companyId;
}
