// The shared part of `npm start` and `npm test`: database up and migrated, demo seeded, app built.
import { defaultDataDir, startPostgres, type PgServer } from './postgres';
import { ensureBuild } from './build';
import type { RunConfig } from './config';

export async function prepare(c: RunConfig, opts: { throwaway: boolean }): Promise<PgServer> {
  const server = await startPostgres({
    port: c.pgPort,
    dataDir: defaultDataDir(c.pgPort, opts.throwaway),
    fresh: opts.throwaway,
  });
  process.env.DATABASE_URL = server.url;
  process.env.DEMO_PASSWORD = c.demoPassword;
  process.env.DEVICE_TOKEN_SEED = c.deviceTokenSeed;
  // Read with the rest of the environment at the seed: the demo's documents go to this fake S3 later (scripts/seed.ts).
  process.env.S3_PORT = String(c.s3Port);
  // Imported late: the database client reads DATABASE_URL when first used.
  const { runMigrations } = await import('../migrate');
  const { seedIfEmpty } = await import('../seed');
  const { closeDb } = await import('../../src/db');
  await runMigrations();
  const seeded = await seedIfEmpty();
  await closeDb();
  console.log(
    `[db] PostgreSQL on 127.0.0.1:${c.pgPort} (data in ${server.dataDir})${seeded ? ', demo scenario seeded' : ''}`,
  );
  ensureBuild();
  return server;
}
