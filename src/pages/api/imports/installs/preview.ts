import { csvFromRequest, previewInstalls } from '../../../../lib/imports/installs.server';
import { requireViewer } from '../../../../lib/server/authz';
import { endpoint } from '../../../../lib/server/endpoint';
import { json } from '../../../../lib/server/http';

/** Checks a CSV of existing installs and lists each row's problems; stores nothing. */
export const POST = endpoint(async ({ locals, request }) => {
  const viewer = requireViewer(locals, ['admin']);
  return json(await previewInstalls(viewer, await csvFromRequest(request)));
});
