import { listPendingInvitations } from '../../../db/queries/invitations';
import { inviteStaff } from '../../../lib/accounts/invitations';
import { staffInvitationSchema } from '../../../lib/accounts/schemas';
import { requireViewer } from '../../../lib/server/authz';
import { jsonBody } from '../../../lib/server/body';
import { endpoint } from '../../../lib/server/endpoint';
import { json } from '../../../lib/server/http';

/** The company's pending invitations (staff and householders). */
export const GET = endpoint(async ({ locals }) => {
  const viewer = requireViewer(locals, ['admin']);
  return json({ invitations: await listPendingInvitations(viewer.companyId) });
});

/** Invite a member of staff: { email, name?, role }. */
export const POST = endpoint(async ({ locals, request }) => {
  const viewer = requireViewer(locals, ['admin']);
  const input = await jsonBody(request, staffInvitationSchema);
  return json({ invitation: await inviteStaff(viewer, input) }, 201);
});
