import { acknowledgeAlerts } from '../../../db/queries/alerts';
import { recordAudit } from '../../../db/queries/audit';
import { acknowledgeSchema } from '../../../lib/alerts/contracts';
import { requireViewer, scopeOf } from '../../../lib/server/authz';
import { jsonBody } from '../../../lib/server/body';
import { endpoint } from '../../../lib/server/endpoint';
import { json } from '../../../lib/server/http';
import { staffRoles } from '@/db/schema/companies';

/** POST /api/alerts/acknowledge { ids, note? }: acknowledges the open ones among them (bulk). */
export const POST = endpoint(async ({ locals, request }) => {
  const viewer = requireViewer(locals, staffRoles);
  const body = await jsonBody(request, acknowledgeSchema);
  const done = await acknowledgeAlerts(scopeOf(viewer), body.ids, viewer.userId, body.note);
  if (done.length)
    await recordAudit({
      companyId: viewer.companyId,
      actorUserId: viewer.userId,
      action: 'alerts.acknowledged',
      subject: done.length === 1 ? `alert:${done[0]}` : null,
      detail: { ids: done, note: body.note },
    });
  return json({ acknowledged: done });
});
