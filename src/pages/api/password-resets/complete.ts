import { completePasswordReset } from '../../../db/queries/password-resets';
import { resetCompleteSchema } from '../../../lib/accounts/schemas';
import { clearAccountFailures } from '../../../lib/auth/throttle';
import { issueSession } from '../../../lib/auth/session';
import { hashLinkToken, normaliseEmail } from '../../../lib/auth/tokens';
import { HttpError } from '../../../lib/server/authz';
import { jsonBody } from '../../../lib/server/body';
import { endpoint } from '../../../lib/server/endpoint';
import { json } from '../../../lib/server/http';
import { hashPassword } from '../../../lib/server/password';
import { clientAddress, isHttps } from '../../../lib/server/request';

const refusals = {
  not_found: [
    404,
    'ResetLinkNotFound',
    'This reset link is not valid. Check that you copied all of it, or ask for a new one.',
  ],
  used: [410, 'ResetLinkUsed', 'This reset link has already been used. Ask for a new one if you still need it.'],
  expired: [410, 'ResetLinkExpired', 'This reset link has expired. Ask for a new one.'],
} as const;

/** Choose a new password with a reset link: { token, password }. Signs out every other session, signs this one in. */
export const POST = endpoint(async (context) => {
  const input = await jsonBody(context.request, resetCompleteSchema);
  const outcome = await completePasswordReset(
    hashLinkToken(input.token),
    await hashPassword(input.password),
    clientAddress(context),
  );
  if (!outcome.ok) {
    const [status, code, message] = refusals[outcome.reason];
    throw new HttpError(status, code, message);
  }
  await clearAccountFailures(normaliseEmail(outcome.user.email));
  await issueSession(context.cookies, outcome.user, isHttps(context));
  return json({ redirect: '/' });
});
