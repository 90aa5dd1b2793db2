import { requireViewer, scopeOf } from '../../../lib/server/authz';
import { endpoint } from '../../../lib/server/endpoint';
import { json } from '../../../lib/server/http';
import { fleetEnergyQuery } from '../../../lib/tank-energy/contracts';
import { fleetEnergy } from '../../../lib/tank-energy/energy.server';

/** GET /api/fleet/energy?from&to: the company's energy averages and the homes outside Tukey's fences on cost per litre and DHW COP. */
export const GET = endpoint(async ({ locals, url }) => {
  const viewer = requireViewer(locals, ['admin', 'operator']);
  const q = fleetEnergyQuery.parse(Object.fromEntries(url.searchParams));
  return json(await fleetEnergy(scopeOf(viewer), q));
});
