import { endpoint } from '../../lib/server/endpoint';
import { json } from '../../lib/server/http';
import { deviceFromAuthorization, ingestHttp, readLimitedBody } from '../../lib/telemetry/http-ingest.server';

/**
 * POST /api/ingest: a reading or a batch `{ readings: [...] }` from a gateway, with the tank's
 * device token as a bearer token. 202 with counts of accepted, duplicate and rejected readings;
 * 400 for a malformed body, 401 for a bad token, 403 when the body names another tank, 413 for
 * an oversized batch, 503 when nothing could be stored (send it again). See docs/wire-contract.md.
 */
export const POST = endpoint(async ({ request }) => {
  const tank = await deviceFromAuthorization(request.headers.get('authorization'));
  const body = await readLimitedBody(request);
  return json(await ingestHttp(tank, body), 202);
});
