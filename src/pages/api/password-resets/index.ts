import { requestPasswordReset } from '../../../lib/accounts/password-reset';
import { resetRequestSchema } from '../../../lib/accounts/schemas';
import { jsonBody } from '../../../lib/server/body';
import { endpoint } from '../../../lib/server/endpoint';
import { json } from '../../../lib/server/http';
import { clientAddress } from '../../../lib/server/request';

/** Ask for a reset link: { email }. The answer is the same whether or not the address has an account. */
export const POST = endpoint(async (context) => {
  const { email } = await jsonBody(context.request, resetRequestSchema);
  await requestPasswordReset(email, clientAddress(context));
  return json({ message: 'If an account uses that address, we have sent it a link to choose a new password.' }, 202);
});
