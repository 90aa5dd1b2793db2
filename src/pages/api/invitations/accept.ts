import { acceptInvitation } from '../../../db/queries/invitations';
import { acceptInvitationSchema } from '../../../lib/accounts/schemas';
import { issueSession } from '../../../lib/auth/session';
import { hashLinkToken } from '../../../lib/auth/tokens';
import { HttpError } from '../../../lib/server/authz';
import { jsonBody } from '../../../lib/server/body';
import { endpoint } from '../../../lib/server/endpoint';
import { json } from '../../../lib/server/http';
import { hashPassword } from '../../../lib/server/password';
import { isHttps } from '../../../lib/server/request';

const refusals = {
  not_found: [404, 'InvitationNotFound', 'This invitation link is not valid. Check that you copied all of it.'],
  used: [410, 'InvitationUsed', 'This invitation has already been used. Sign in instead, or ask for a new invitation.'],
  expired: [410, 'InvitationExpired', 'This invitation has expired. Ask the person who invited you to send a new one.'],
  revoked: [
    410,
    'InvitationWithdrawn',
    'This invitation has been withdrawn. Ask the person who invited you if you still need access.',
  ],
  other_company: [
    409,
    'AccountBelongsElsewhere',
    'This e-mail address already has an account with another company. Ask to be invited at a different address.',
  ],
  password_required: [400, 'PasswordRequired', 'Choose a password for your new account.'],
} as const;

/** Accept an invitation: { token, name?, password? }. Lands the person signed in. */
export const POST = endpoint(async (context) => {
  const input = await jsonBody(context.request, acceptInvitationSchema);
  const outcome = await acceptInvitation(hashLinkToken(input.token), {
    name: input.name ?? null,
    passwordHash: input.password ? await hashPassword(input.password) : null,
  });
  if (!outcome.ok) {
    const [status, code, message] = refusals[outcome.reason];
    throw new HttpError(
      status,
      code,
      message,
      outcome.reason === 'password_required' ? [{ field: 'password', message }] : undefined,
    );
  }
  await issueSession(context.cookies, outcome.user, isHttps(context));
  return json({ redirect: '/', role: outcome.role, created: outcome.created });
});
