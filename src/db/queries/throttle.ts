import { and, eq, gt, lt, sql } from 'drizzle-orm';
import { db } from '..';
import { throttleEvents, type ThrottleKind } from '../schema';

export interface RecentEvents {
  count: number;
  oldest: Date | null;
  newest: Date | null;
}

/** Events counted for a key inside the window ending now, and when the oldest and newest happened. */
export async function recentEvents(kind: ThrottleKind, key: string, windowMs: number): Promise<RecentEvents> {
  const since = new Date(Date.now() - windowMs);
  const [row] = await db()
    .select({
      count: sql<number>`count(*)::int`,
      oldest: sql<Date | null>`min(${throttleEvents.at})`,
      newest: sql<Date | null>`max(${throttleEvents.at})`,
    })
    .from(throttleEvents)
    .where(and(eq(throttleEvents.kind, kind), eq(throttleEvents.key, key), gt(throttleEvents.at, since)));
  const date = (d: Date | null) => (d ? new Date(d) : null);
  return { count: row.count, oldest: date(row.oldest), newest: date(row.newest) };
}

export async function addEvent(kind: ThrottleKind, key: string): Promise<void> {
  await db().insert(throttleEvents).values({ kind, key });
  // Keep the table small: events older than a day count for nothing.
  if (Math.random() < 0.05)
    await db()
      .delete(throttleEvents)
      .where(lt(throttleEvents.at, new Date(Date.now() - 86_400_000)));
}

export async function clearEvents(kind: ThrottleKind, key: string): Promise<void> {
  await db()
    .delete(throttleEvents)
    .where(and(eq(throttleEvents.kind, kind), eq(throttleEvents.key, key)));
}

/** Clears every key of a kind that starts with `prefix` (starts_with: no LIKE wildcards to escape). */
export async function clearEventsWithPrefix(kind: ThrottleKind, prefix: string): Promise<void> {
  await db()
    .delete(throttleEvents)
    .where(and(eq(throttleEvents.kind, kind), sql`starts_with(${throttleEvents.key}, ${prefix})`));
}
