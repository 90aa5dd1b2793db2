import { requireTank, requireViewer, scopeOf } from '../../../../../lib/server/authz';
import { jsonBody } from '../../../../../lib/server/body';
import { findEnergyTank } from '../../../../../db/queries/energy';
import { endpoint } from '../../../../../lib/server/endpoint';
import { json } from '../../../../../lib/server/http';
import { planBody } from '../../../../../lib/tank-energy/contracts';
import { tankPlan } from '../../../../../lib/tank-energy/energy.server';

/** POST /api/tanks/{id}/plan `{ comfortFloorL40?, hours? }`: the cheapest charge plan from now, with the fixed schedule it beats. */
export const POST = endpoint(async ({ locals, params, request }) => {
  const scope = scopeOf(requireViewer(locals));
  await requireTank(findEnergyTank, scope, params.id);
  const body = await jsonBody(request, planBody, { emptyAs: {} });
  return json((await tankPlan(scope, params.id, body)).plan);
});
