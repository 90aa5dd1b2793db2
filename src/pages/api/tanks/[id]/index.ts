import { requireViewer, scopeOf } from '../../../../lib/server/authz';
import { endpoint } from '../../../../lib/server/endpoint';
import { json } from '../../../../lib/server/http';
import { tankDetail } from '../../../../lib/views/tank-detail.server';

/** GET /api/tanks/{id}: one tank in depth; 404 for a tank outside the viewer's scope. */
export const GET = endpoint(async ({ locals, params }) => {
  const viewer = requireViewer(locals);
  return json(await tankDetail(scopeOf(viewer), params.id ?? ''));
});
