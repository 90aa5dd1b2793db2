import { recordAudit } from '../../../../db/queries/audit';
import { endAllUserSessions } from '../../../../db/queries/sessions';
import { clearSessionCookie } from '../../../../lib/auth/session';
import { requireViewer } from '../../../../lib/server/authz';
import { endpoint } from '../../../../lib/server/endpoint';
import { json } from '../../../../lib/server/http';
import { isHttps, isPageNavigation } from '../../../../lib/server/request';

/**
 * Sign out everywhere: ends every session of the signed-in person, this one included (a lost
 * phone, a shared computer). The account menu posts here as a plain form and lands on the
 * sign-in page; a script gets { sessionsEnded }.
 */
export const POST = endpoint(async (context) => {
  const viewer = requireViewer(context.locals);
  const sessionsEnded = await endAllUserSessions(viewer.userId);
  await recordAudit({
    companyId: viewer.companyId,
    actorUserId: viewer.userId,
    action: 'sessions.ended',
    subject: `user:${viewer.userId}`,
    detail: { sessionsEnded },
  });
  clearSessionCookie(context.cookies, isHttps(context));
  if (isPageNavigation(context)) return context.redirect('/signin?signedOut=everywhere', 303);
  return json({ sessionsEnded });
});
