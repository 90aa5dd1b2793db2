import type { APIRoute } from 'astro';
import { checkDatabase } from '../../db/queries/health';
import { json } from '../../lib/server/http';

/** Liveness and database status, for people and for monitoring. Public: it reveals no data and no software versions. */
export const GET: APIRoute = async () => {
  const database = await checkDatabase();
  return json(
    { status: database.up ? 'ok' : 'degraded', database, time: new Date().toISOString() },
    database.up ? 200 : 503,
  );
};
