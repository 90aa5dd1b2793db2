import { listTanks } from '../../../db/queries/tanks';
import { requireViewer, scopeOf } from '../../../lib/server/authz';
import { endpoint } from '../../../lib/server/endpoint';
import { json } from '../../../lib/server/http';
import { searchParams, tanksQuerySchema } from '../../../lib/views/contracts';
import { staffRoles } from '@/db/schema/companies';

/** GET /api/tanks: the viewer's tanks with latest state; filter, sort and page in the query string. */
export const GET = endpoint(async ({ locals, url }) => {
  const viewer = requireViewer(locals, staffRoles);
  const query = tanksQuerySchema.parse(searchParams(url));
  return json(await listTanks(scopeOf(viewer), query));
});
