import { latestTelemetry } from '../../../db/queries/commissioning';
import { findTankInScope } from '../../../db/queries/telemetry';
import { createVisit, listInspectionsDue } from '../../../db/queries/visits';
import { DUE_SOON_DAYS, dueState } from '../../../lib/commissioning/service-due';
import { visitSchema } from '../../../lib/commissioning/visit-form';
import { HttpError, requireTank, requireViewer, scopeOf } from '../../../lib/server/authz';
import { jsonBody } from '../../../lib/server/body';
import { endpoint } from '../../../lib/server/endpoint';
import { json } from '../../../lib/server/http';
import { staffRoles } from '@/db/schema/companies';

/** Annual inspections overdue or due within the next days (default 30), most overdue first. */
export const GET = endpoint(async ({ locals, url }) => {
  const viewer = requireViewer(locals);
  const days = Math.min(Math.max(Number(url.searchParams.get('withinDays') ?? DUE_SOON_DAYS) || DUE_SOON_DAYS, 0), 366);
  const now = new Date();
  const rows = await listInspectionsDue(viewer.companyId, new Date(now.getTime() + days * 86_400_000));
  return json({ due: rows.map((r) => ({ ...r, state: dueState(r.dueAt, now) })) });
});

/** Records a service visit: findings, parts, readings, resolved alerts and photos already uploaded. */
export const POST = endpoint(async ({ locals, request }) => {
  const viewer = requireViewer(locals, staffRoles);
  const input = await jsonBody(request, visitSchema);
  const tank = await requireTank(findTankInScope, scopeOf(viewer), input.tankId);
  // The tank's own layers at the time, kept with the engineer's readings.
  const t = await latestTelemetry(tank.id);
  const readings = {
    ...input.readings,
    ...(t ? { telemetryLayersC: t.layersC, telemetryAt: t.ts.toISOString() } : {}),
  };
  const r = await createVisit({ ...input, companyId: viewer.companyId, engineerUserId: viewer.userId, readings });
  if (!r.ok && r.reason === 'alerts')
    throw new HttpError(
      422,
      'UnknownAlerts',
      'Some alerts are not this tank’s or are already resolved; nothing was recorded. Reload the page and choose again.',
      r.missing.map((id) => ({ field: 'resolvedAlertIds', message: `Alert ${id} cannot be resolved here.` })),
    );
  if (!r.ok)
    throw new HttpError(
      422,
      'UnknownUploads',
      'Some photos are not this tank’s or already belong to another visit; nothing was recorded. Upload them again.',
      r.missing.map((id) => ({ field: 'uploadIds', message: `Photo ${id} cannot be attached.` })),
    );
  return json({ visit: r.visit }, 201);
});
