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

let standby: { pool: pg.Pool; db: Db } | null | undefined;

/** The hot standby's client (DATABASE_READ_URL), or null when there is none. */
function standbyDb(): Db | null {
  if (standby === undefined) {
    const url = env().DATABASE_READ_URL;
    if (!url) standby = null;
    else {
      const p = new pg.Pool({ connectionString: url, max: 10, idleTimeoutMillis: 30_000 });
      p.on('error', (err) => console.error('[db] standby idle client error:', err.message));
      p.on('connect', (client) =>
        client.on('error', (err) => console.error('[db] standby client error:', err.message)),
      );
      standby = { pool: p, db: drizzle(p, { schema }) };
    }
  }
  return standby?.db ?? null;
}

/** Errors that mean the server could not be reached or went away, not that the query was wrong. */
const UNREACHABLE = new Set([
  'ECONNREFUSED',
  'ECONNRESET',
  'ETIMEDOUT',
  'EHOSTUNREACH',
  '57P01',
  '57P02',
  '57P03',
  '08000',
  '08001',
  '08003',
  '08006',
]);
const unreachable = (err: unknown): boolean => {
  const e = err as { code?: string; cause?: { code?: string }; message?: string };
  const code = e?.code ?? e?.cause?.code;
  return (code !== undefined && UNREACHABLE.has(code)) || /Connection terminated/i.test(e?.message ?? '');
};

/**
 * A read that may lag a few seconds (the fleet list and summary, charts): on the hot standby when
 * DATABASE_READ_URL names one, on the primary when it does not or the standby cannot be reached.
 * Writes, and reads of what was just written, use `db()`.
 */
export async function lagTolerant<T>(read: (d: Db) => Promise<T>): Promise<T> {
  const s = standbyDb();
  if (!s) return read(db());
  try {
    return await read(s);
  } catch (err) {
    if (!unreachable(err)) throw err;
    console.error('[db] the standby cannot be reached; reading from the primary:', (err as Error).message);
    return read(db());
  }
}

export async function closeDb(): Promise<void> {
  const p = pool;
  const s = standby;
  pool = undefined;
  database = undefined;
  standby = undefined;
  await Promise.all([p?.end(), s?.pool.end()]);
}

export { schema };
