import pg from 'pg';
import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres';
import { env } from '../lib/server/env';
import * as schema from './schema';

/**
 * The one database client. Only modules under src/db/queries (and the telemetry writer, which
 * needs COPY) import it; everything else calls named query functions.
 */
export type Db = NodePgDatabase<typeof schema>;
/** A transaction's handle, for functions that take part in their caller's transaction. */
export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

let pool: pg.Pool | undefined;
let database: Db | undefined;

export function getPool(): pg.Pool {
  if (!pool) {
    pool = new pg.Pool({ connectionString: env().DATABASE_URL, max: 10, idleTimeoutMillis: 30_000 });
    // An idle client losing its connection (server restart) must not crash the process.
    pool.on('error', (err) => console.error('[db] idle client error:', err.message));
    // Nor a checked-out one: without a listener its 'error' event would throw (the query in
    // flight still rejects, and the pool drops the client when it is released with the error).
    pool.on('connect', (client) => client.on('error', (err) => console.error('[db] client error:', err.message)));
  }
  return pool;
}

export function db(): Db {
  database ??= drizzle(getPool(), { schema });
  return database;
}

export async function closeDb(): Promise<void> {
  const p = pool;
  pool = undefined;
  database = undefined;
  await p?.end();
}

export { schema };
