import { deleteHeatPumpModel } from '../../../../db/queries/commissioning';
import { HttpError, requireViewer } from '../../../../lib/server/authz';
import { endpoint } from '../../../../lib/server/endpoint';

/** Removes a model from the list (records already signed keep the curve they were set with). */
export const DELETE = endpoint(async ({ locals, params }) => {
  const viewer = requireViewer(locals, ['admin']);
  if (!(await deleteHeatPumpModel(viewer.companyId, params.id ?? '', viewer.userId)))
    throw new HttpError(404, 'NotFound', 'There is no such heat-pump model.');
  return new Response(null, { status: 204 });
});
