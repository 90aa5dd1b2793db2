import { listUploads } from '../../../db/queries/commissioning';
import { getVisit } from '../../../db/queries/visits';
import { HttpError, requireViewer } from '../../../lib/server/authz';
import { endpoint } from '../../../lib/server/endpoint';
import { json } from '../../../lib/server/http';

/** One visit with its photos. */
export const GET = endpoint(async ({ locals, params }) => {
  const viewer = requireViewer(locals);
  const visit = await getVisit(viewer.companyId, params.id ?? '');
  if (!visit) throw new HttpError(404, 'NotFound', 'There is no such visit.');
  const photos = await listUploads(viewer.companyId, { visitId: visit.id });
  return json({
    visit,
    uploads: photos.map((u) => ({ id: u.id, kind: u.kind, filename: u.filename, url: `/api/uploads/${u.id}` })),
  });
});
