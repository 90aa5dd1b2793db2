import { z } from '@/lib/zod';
import { listAmendments, listUploads } from '../../../../db/queries/commissioning';
import { loadCommissioning, saveStep } from '../../../../lib/commissioning/flow.server';
import { stepIds } from '../../../../lib/commissioning/steps';
import { requireViewer } from '../../../../lib/server/authz';
import { jsonBody } from '../../../../lib/server/body';
import { endpoint } from '../../../../lib/server/endpoint';
import { json } from '../../../../lib/server/http';

/** One commissioning: the draft's answers (or the signed record), its uploads and amendments. */
export const GET = endpoint(async ({ locals, params }) => {
  const viewer = requireViewer(locals);
  const row = await loadCommissioning(viewer, params.id ?? '');
  const [uploads, amendments] = await Promise.all([
    listUploads(viewer.companyId, { commissioningId: row.id }),
    listAmendments(row.id),
  ]);
  return json({
    id: row.id,
    status: row.status,
    step: row.step,
    data: row.data,
    tankId: row.tankId,
    homeId: row.homeId,
    record: row.record,
    signedAt: row.signedAt,
    handoverSentAt: row.handoverSentAt,
    uploads: uploads.map((u) => ({
      id: u.id,
      kind: u.kind,
      filename: u.filename,
      bytes: u.bytes,
      width: u.width,
      height: u.height,
      url: `/api/uploads/${u.id}`,
    })),
    amendments,
  });
});

const saveSchema = z.object({
  step: z.enum(stepIds, { error: `step must be one of: ${stepIds.join(', ')}.` }),
  values: z.record(z.string(), z.unknown()).default({}),
});

/** Saves one step of the draft: { step, values }. Field errors name `step.field`. */
export const PATCH = endpoint(async ({ locals, params, request }) => {
  const viewer = requireViewer(locals, ['admin', 'engineer']);
  // The record first: another company's id is "not found" whatever the body says.
  await loadCommissioning(viewer, params.id ?? '');
  const { step, values } = await jsonBody(request, saveSchema);
  const row = await saveStep(viewer, params.id ?? '', step, values);
  return json({ id: row.id, step: row.step, data: row.data });
});
