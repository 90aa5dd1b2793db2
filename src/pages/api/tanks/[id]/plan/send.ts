import { requireTank, requireViewer, scopeOf } from '../../../../../lib/server/authz';
import { jsonBody } from '../../../../../lib/server/body';
import { findEnergyTank } from '../../../../../db/queries/energy';
import { endpoint } from '../../../../../lib/server/endpoint';
import { json } from '../../../../../lib/server/http';
import { planBody } from '../../../../../lib/tank-energy/contracts';
import { sendPlan } from '../../../../../lib/tank-energy/energy.server';

/**
 * POST /api/tanks/{id}/plan/send `{ comfortFloorL40?, hours? }`: plans from now and sends the first
 * day's windows to the tank as a set_schedule command (the same path as POST …/commands).
 */
export const POST = endpoint(async ({ locals, params, request }) => {
  const viewer = requireViewer(locals);
  const scope = scopeOf(viewer);
  await requireTank(findEnergyTank, scope, params.id);
  const body = await jsonBody(request, planBody, { emptyAs: {} });
  return json(await sendPlan(viewer, scope, params.id, body), 202);
});
