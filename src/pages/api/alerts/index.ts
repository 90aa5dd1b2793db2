import { listAlerts } from '../../../db/queries/alerts';
import { alertListQuerySchema } from '../../../lib/alerts/contracts';
import type { AlertFilters } from '../../../db/queries/alerts';
import { requireViewer, scopeOf } from '../../../lib/server/authz';
import { endpoint } from '../../../lib/server/endpoint';
import { json } from '../../../lib/server/http';
import { staffRoles } from '@/db/schema/companies';

/** GET /api/alerts: the company's alerts, unresolved by default; filter by kind, severity, state, assignee, town, tank. */
export const GET = endpoint(async ({ locals, url }) => {
  const viewer = requireViewer(locals, staffRoles);
  const q = alertListQuerySchema.parse(Object.fromEntries(url.searchParams.entries()));
  return json(await listAlerts(scopeOf(viewer), q as AlertFilters));
});
