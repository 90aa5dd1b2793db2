import { requireViewer, scopeOf } from '../../../../lib/server/authz';
import { endpoint } from '../../../../lib/server/endpoint';
import { json } from '../../../../lib/server/http';
import { energyQuery } from '../../../../lib/tank-energy/contracts';
import { tankEnergy } from '../../../../lib/tank-energy/energy.server';

/** GET /api/tanks/{id}/energy?from&to: each local day's heat by source, electricity, cost, loss, draw and DHW COP, and their months. */
export const GET = endpoint(async ({ locals, params, url }) => {
  const viewer = requireViewer(locals);
  const q = energyQuery.parse(Object.fromEntries(url.searchParams));
  return json(await tankEnergy(scopeOf(viewer), params.id, q));
});
