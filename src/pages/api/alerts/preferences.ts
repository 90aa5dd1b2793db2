import { getNoticePreference, setNoticePreference } from '../../../db/queries/alerts';
import { noticePreferenceSchema } from '../../../lib/alerts/contracts';
import { requireViewer } from '../../../lib/server/authz';
import { jsonBody } from '../../../lib/server/body';
import { endpoint } from '../../../lib/server/endpoint';
import { json } from '../../../lib/server/http';

/** GET /api/alerts/preferences: whether the signed-in person receives householder notices. */
export const GET = endpoint(async ({ locals }) => {
  const viewer = requireViewer(locals);
  return json({ householderNotices: await getNoticePreference(viewer.userId) });
});

/** PUT /api/alerts/preferences { householderNotices }: opt in or out. */
export const PUT = endpoint(async ({ locals, request }) => {
  const viewer = requireViewer(locals);
  const body = await jsonBody(request, noticePreferenceSchema);
  await setNoticePreference(viewer.userId, body.householderNotices);
  return json(body);
});
