import { commitInstalls, csvFromRequest } from '../../../../lib/imports/installs.server';
import { requireViewer } from '../../../../lib/server/authz';
import { endpoint } from '../../../../lib/server/endpoint';
import { json } from '../../../../lib/server/http';

/** Imports a CSV of existing installs: every row in one transaction, or none (422 lists each bad row). */
export const POST = endpoint(async ({ locals, request }) => {
  const viewer = requireViewer(locals, ['admin']);
  return json(await commitInstalls(viewer, await csvFromRequest(request)), 201);
});
