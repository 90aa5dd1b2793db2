import { registerForConnection } from '../../../../lib/commissioning/flow.server';
import { requireViewer } from '../../../../lib/server/authz';
import { endpoint } from '../../../../lib/server/endpoint';
import { json } from '../../../../lib/server/http';

/** Registers the cylinder and issues its device token (shown once) for the connection check. */
export const POST = endpoint(async ({ locals, params }) => {
  const viewer = requireViewer(locals, ['admin', 'engineer']);
  return json(await registerForConnection(viewer, params.id ?? ''), 201);
});
