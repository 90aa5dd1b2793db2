import { createDraft, listCommissionings } from '../../../db/queries/commissioning';
import { requireViewer } from '../../../lib/server/authz';
import { endpoint } from '../../../lib/server/endpoint';
import { json } from '../../../lib/server/http';

/** The company's commissioning drafts and records, newest first. */
export const GET = endpoint(async ({ locals }) => {
  const viewer = requireViewer(locals);
  return json({ commissionings: await listCommissionings(viewer.companyId) });
});

/** Starts a new commissioning draft; the wizard opens on its first step. */
export const POST = endpoint(async ({ locals }) => {
  const viewer = requireViewer(locals, ['admin', 'engineer']);
  const row = await createDraft(viewer.companyId, viewer.userId);
  return json({ id: row.id, step: row.step, redirect: `/commissioning/${row.id}` }, 201);
});
