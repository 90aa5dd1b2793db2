import { fleetSummary } from '../../../db/queries/fleet';
import { requireViewer, scopeOf } from '../../../lib/server/authz';
import { endpoint } from '../../../lib/server/endpoint';
import { json } from '../../../lib/server/http';

/** GET /api/fleet/summary: counts and distributions for the fleet strip, and the triage queue. */
export const GET = endpoint(async ({ locals }) => {
  const viewer = requireViewer(locals, ['admin', 'operator']);
  return json(await fleetSummary(scopeOf(viewer)));
});
