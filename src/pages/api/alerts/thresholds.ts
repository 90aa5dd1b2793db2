import { getThresholdOverrides, saveThresholdOverrides } from '../../../db/queries/alerts';
import { recordAudit } from '../../../db/queries/audit';
import { resolveThresholds, thresholdOverridesSchema } from '../../../lib/alerts/thresholds';
import { requireViewer } from '../../../lib/server/authz';
import { jsonBody } from '../../../lib/server/body';
import { endpoint } from '../../../lib/server/endpoint';
import { json } from '../../../lib/server/http';

/** GET /api/alerts/thresholds: the company's changes and the thresholds in force. */
export const GET = endpoint(async ({ locals }) => {
  const viewer = requireViewer(locals, ['admin']);
  const overrides = await getThresholdOverrides(viewer.companyId);
  return json({ overrides, effective: resolveThresholds(overrides) });
});

/** PUT /api/alerts/thresholds { …changed settings }: replaces the company's changes (the rest stay at their defaults). */
export const PUT = endpoint(async ({ locals, request }) => {
  const viewer = requireViewer(locals, ['admin']);
  const overrides = await jsonBody(request, thresholdOverridesSchema);
  await saveThresholdOverrides(viewer.companyId, overrides, viewer.userId);
  await recordAudit({
    companyId: viewer.companyId,
    actorUserId: viewer.userId,
    action: 'alerts.thresholds_changed',
    subject: null,
    detail: overrides,
  });
  return json({ overrides, effective: resolveThresholds(overrides) });
});
