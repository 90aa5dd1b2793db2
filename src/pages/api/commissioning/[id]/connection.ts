import { connectionState } from '../../../../lib/commissioning/flow.server';
import { requireViewer } from '../../../../lib/server/authz';
import { endpoint } from '../../../../lib/server/endpoint';
import { json } from '../../../../lib/server/http';

/** Whether the cylinder has reported yet, and its layers when it has (the wizard polls this). */
export const GET = endpoint(async ({ locals, params }) => {
  const viewer = requireViewer(locals);
  return json(await connectionState(viewer, params.id ?? ''));
});
