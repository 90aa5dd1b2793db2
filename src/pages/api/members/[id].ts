import { findMember } from '../../../db/queries/accounts';
import { changeStaffRole, removeStaffMember, type MemberChange } from '../../../db/queries/members';
import { roleChangeSchema } from '../../../lib/accounts/schemas';
import { HttpError, requireViewer } from '../../../lib/server/authz';
import { jsonBody } from '../../../lib/server/body';
import { endpoint } from '../../../lib/server/endpoint';
import { json } from '../../../lib/server/http';

function refuse(result: Extract<MemberChange, { ok: false }>): never {
  if (result.reason === 'last_admin') {
    throw new HttpError(
      409,
      'LastAdministrator',
      'The company needs at least one administrator. Make someone else an administrator first.',
    );
  }
  throw new HttpError(404, 'NotFound', 'There is no member of staff with that id in your company.');
}

/** Change a staff member's role: { role }. */
export const PATCH = endpoint(async ({ locals, params, request }) => {
  const viewer = requireViewer(locals, ['admin']);
  // The member first: another company's id is "not found" whatever the body says.
  const member = await findMember(viewer.companyId, params.id ?? '');
  if (!member || member.role === 'householder') refuse({ ok: false, reason: 'not_found' });
  const { role } = await jsonBody(request, roleChangeSchema);
  const result = await changeStaffRole(viewer.companyId, params.id ?? '', role, viewer.userId);
  if (!result.ok) refuse(result);
  return json({ userId: params.id, role, previousRole: result.from });
});

/** Remove a member of staff from the company. */
export const DELETE = endpoint(async ({ locals, params }) => {
  const viewer = requireViewer(locals, ['admin']);
  const result = await removeStaffMember(viewer.companyId, params.id ?? '', viewer.userId);
  if (!result.ok) refuse(result);
  return new Response(null, { status: 204 });
});
