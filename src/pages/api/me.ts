import { endpoint } from '../../lib/server/endpoint';
import { requireViewer } from '../../lib/server/authz';
import { json } from '../../lib/server/http';
import { roleLabels } from '../../lib/server/viewer';

/** Who is signed in: the person, their company, role and (householders) homes. */
export const GET = endpoint(async ({ locals }) => {
  const viewer = requireViewer(locals);
  return json({ ...viewer, roleLabel: roleLabels[viewer.role] });
});
