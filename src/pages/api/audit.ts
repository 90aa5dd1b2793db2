import { z } from '@/lib/zod';
import { listAudit } from '../../db/queries/audit';
import { requireViewer } from '../../lib/server/authz';
import { endpoint } from '../../lib/server/endpoint';
import { json } from '../../lib/server/http';

const querySchema = z.object({
  before: z.coerce.number().int().positive().max(Number.MAX_SAFE_INTEGER).optional(),
  limit: z.coerce.number().int().min(1).max(500).default(50),
});

/** The company's audit log, newest first; page back with ?before=<id>. */
export const GET = endpoint(async ({ locals, url }) => {
  const viewer = requireViewer(locals, ['admin']);
  const q = querySchema.parse(Object.fromEntries(url.searchParams));
  const entries = await listAudit(viewer.companyId, { limit: q.limit, beforeId: q.before });
  return json({ entries, next: entries.length === q.limit ? entries[entries.length - 1].id : null });
});
