import { sql } from 'drizzle-orm';
import { db } from '..';

/** Round-trip to the database; resolves with the server's latency and version. */
export async function checkDatabase(): Promise<{ up: true; latencyMs: number; version: string } | { up: false; error: string }> {
  const started = performance.now();
  try {
    const res = await db().execute<{ version: string }>(sql`select current_setting('server_version') as version`);
    return { up: true, latencyMs: Math.round((performance.now() - started) * 10) / 10, version: res.rows[0].version };
  } catch (err) {
    return { up: false, error: err instanceof Error ? err.message : String(err) };
  }
}
