import { assignAlert, getAlert, notificationsOf, resolveAlert } from '../../../db/queries/alerts';
import { recordAudit } from '../../../db/queries/audit';
import { alertActionSchema } from '../../../lib/alerts/contracts';
import { HttpError, requireViewer, scopeOf } from '../../../lib/server/authz';
import { jsonBody } from '../../../lib/server/body';
import { endpoint } from '../../../lib/server/endpoint';
import { json } from '../../../lib/server/http';
import { staffRoles } from '@/db/schema/companies';

const notFound = () => new HttpError(404, 'AlertNotFound', 'No such alert in your company.');

/** GET /api/alerts/{id}: one alert with its evidence and the e-mails sent about it. */
export const GET = endpoint(async ({ locals, params }) => {
  const viewer = requireViewer(locals, staffRoles);
  const alert = await getAlert(scopeOf(viewer), params.id ?? '');
  if (!alert) throw notFound();
  return json({ ...alert, notifications: await notificationsOf(alert.id) });
});

/** PATCH /api/alerts/{id} { action: 'resolve', note? } | { action: 'assign', assigneeId }. */
export const PATCH = endpoint(async ({ locals, params, request }) => {
  const viewer = requireViewer(locals, staffRoles);
  const scope = scopeOf(viewer);
  const body = await jsonBody(request, alertActionSchema);
  const id = params.id ?? '';
  if (!(await getAlert(scope, id))) throw notFound();
  if (body.action === 'resolve') {
    if (!(await resolveAlert(scope, id, viewer.userId, body.note)))
      throw new HttpError(409, 'AlertAlreadyResolved', 'This alert is already resolved.');
  } else if (!(await assignAlert(scope, id, body.assigneeId))) {
    throw new HttpError(422, 'InvalidAssignee', 'The assignee must be a staff member of your company.', [
      { field: 'assigneeId', message: 'is not a staff member of your company.' },
    ]);
  }
  await recordAudit({
    companyId: viewer.companyId,
    actorUserId: viewer.userId,
    action: body.action === 'resolve' ? 'alerts.resolved' : 'alerts.assigned',
    subject: `alert:${id}`,
    detail: body,
  });
  return json(await getAlert(scope, id));
});
