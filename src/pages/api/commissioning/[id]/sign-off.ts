import { signOff } from '../../../../lib/commissioning/flow.server';
import { requireViewer } from '../../../../lib/server/authz';
import { endpoint } from '../../../../lib/server/endpoint';
import { json } from '../../../../lib/server/http';

/** Signs off and locks the record, makes its PDF and sends the householder's invitation and record. */
export const POST = endpoint(async ({ locals, params }) => {
  const viewer = requireViewer(locals, ['admin', 'engineer']);
  return json(await signOff(viewer, params.id ?? ''));
});
