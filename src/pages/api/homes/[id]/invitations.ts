import { listHomeHouseholders } from '../../../../db/queries/accounts';
import { getHomeInScope } from '../../../../db/queries/home-access';
import { listPendingInvitations } from '../../../../db/queries/invitations';
import { inviteHouseholder } from '../../../../lib/accounts/invitations';
import { householderInvitationSchema } from '../../../../lib/accounts/schemas';
import { HttpError, requireViewer, scopeOf } from '../../../../lib/server/authz';
import { jsonBody } from '../../../../lib/server/body';
import { endpoint } from '../../../../lib/server/endpoint';
import { json } from '../../../../lib/server/http';

/** Who can see this home, and who has been invited to. */
export const GET = endpoint(async ({ locals, params }) => {
  const viewer = requireViewer(locals);
  const home = await getHomeInScope(scopeOf(viewer), params.id ?? '');
  if (!home) throw new HttpError(404, 'NotFound', 'There is no such home.');
  const [householders, invitations] = await Promise.all([
    listHomeHouseholders(home.id),
    listPendingInvitations(viewer.companyId, { homeId: home.id }),
  ]);
  return json({ householders, invitations });
});

/** Invite the householder of this home (at handover): { email, name? }. */
export const POST = endpoint(async ({ locals, params, request }) => {
  const viewer = requireViewer(locals);
  // The home first: a foreign id is "not found" whatever the body says.
  const home = await getHomeInScope(scopeOf(viewer), params.id ?? '');
  if (!home) throw new HttpError(404, 'NotFound', 'There is no such home.');
  const input = await jsonBody(request, householderInvitationSchema);
  return json({ invitation: await inviteHouseholder(viewer, home.id, input) }, 201);
});
