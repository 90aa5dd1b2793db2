import { revokeInvitation } from '../../../db/queries/invitations';
import { HttpError, requireViewer } from '../../../lib/server/authz';
import { endpoint } from '../../../lib/server/endpoint';

/** Withdraw a pending invitation: its link stops working. */
export const DELETE = endpoint(async ({ locals, params }) => {
  const viewer = requireViewer(locals, ['admin']);
  if (!(await revokeInvitation(viewer.companyId, params.id ?? '', viewer.userId))) {
    throw new HttpError(404, 'NotFound', 'There is no pending invitation with that id.');
  }
  return new Response(null, { status: 204 });
});
