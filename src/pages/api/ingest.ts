import { endpoint } from '../../lib/server/endpoint';
import { bearerToken, forwardToIngest, readLimitedBody } from '../../lib/telemetry/http-ingest.server';

/**
 * POST /api/ingest: a reading or a batch `{ readings: [...] }` from a gateway, with the tank's
 * device token as a bearer token. 202 with counts of accepted, duplicate and rejected readings;
 * 400 for a malformed body, 401 for a bad token, 403 when the body names another tank, 413 for
 * an oversized batch, 503 when nothing could be stored (send it again). See docs/wire-contract.md.
 * The web forwards it to the ingest tier (src/lib/telemetry/http-ingest.server.ts).
 */
export const POST = endpoint(async ({ request }) => {
  const authorization = request.headers.get('authorization');
  bearerToken(authorization);
  const body = await readLimitedBody(request);
  // Checked, validated and stored by the ingest tier (INGEST_PORT), which gateways may also post to directly.
  return forwardToIngest(authorization!, body);
});
