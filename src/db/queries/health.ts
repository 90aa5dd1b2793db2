import { sql } from 'drizzle-orm';
import { db } from '..';

/**
 * Round-trip to the database; resolves with its latency. Nothing about the server (version,
 * address, error text) leaves here: the health endpoint is public. A failure is logged instead.
 */
export async function checkDatabase(): Promise<{ up: true; latencyMs: number } | { up: false }> {
  const started = performance.now();
  try {
    await db().execute(sql`select 1`);
    return { up: true, latencyMs: Math.round((performance.now() - started) * 10) / 10 };
  } catch (err) {
    console.error(`[health] database check failed: ${err instanceof Error ? err.message : String(err)}`);
    return { up: false };
  }
}
