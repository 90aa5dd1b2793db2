import { amend, loadCommissioning } from '../../../../lib/commissioning/flow.server';
import { amendmentSchema } from '../../../../lib/commissioning/amendments';
import { requireViewer } from '../../../../lib/server/authz';
import { jsonBody } from '../../../../lib/server/body';
import { endpoint } from '../../../../lib/server/endpoint';
import { json } from '../../../../lib/server/http';

/** Amends a signed record: { field, value, reason }; kept beside the original with who and when. */
export const POST = endpoint(async ({ locals, params, request }) => {
  const viewer = requireViewer(locals, ['admin', 'engineer']);
  // The record first: another company's id is "not found" whatever the body says.
  await loadCommissioning(viewer, params.id ?? '');
  const input = await jsonBody(request, amendmentSchema);
  return json({ amendment: await amend(viewer, params.id ?? '', input) }, 201);
});
