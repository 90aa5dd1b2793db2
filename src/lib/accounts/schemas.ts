import { z } from '@/lib/zod';
import { messages } from '@/lib/zod-messages';
import { staffRoles } from '../../db/schema/companies';

/**
 * What people type, validated the same way by the forms and the endpoints. Passwords: at
 * least 12 characters and no composition rules (NIST SP 800-63B §5.1.1.2 asks for at least 8
 * and advises against composition rules; 12 is our choice, common practice).
 */
export const PASSWORD_MIN_LENGTH = 12;

const emailField = z
  .string(messages('Enter an e-mail address.'))
  .trim()
  .toLowerCase()
  .email('Enter a valid e-mail address, like name@example.com.')
  .max(320, 'That e-mail address is too long.');
const nameField = z
  .string()
  .trim()
  .max(120, 'Keep the name under 120 characters.')
  .transform((v) => v || null);
const passwordField = z
  .string(messages('Choose a password.'))
  .min(PASSWORD_MIN_LENGTH, `Choose a password of at least ${PASSWORD_MIN_LENGTH} characters.`)
  .max(256, 'Keep the password under 256 characters.');

export { staffRoles };
const staffRoleField = z.enum(staffRoles, { error: 'Choose one of the staff roles.' });

export const staffInvitationSchema = z.object({ email: emailField, name: nameField.optional(), role: staffRoleField });
export type StaffInvitationInput = z.infer<typeof staffInvitationSchema>;

export const householderInvitationSchema = z.object({ email: emailField, name: nameField.optional() });
export type HouseholderInvitationInput = z.infer<typeof householderInvitationSchema>;

const linkTokenField = z
  .string(messages('The link is missing its token.'))
  .min(20, 'The link is incomplete.')
  .max(200, 'The link is not valid.');

export const acceptInvitationSchema = z.object({
  token: linkTokenField,
  name: nameField.optional(),
  password: passwordField.optional(),
});
export const resetRequestSchema = z.object({ email: emailField });
export const resetCompleteSchema = z.object({ token: linkTokenField, password: passwordField });
export const roleChangeSchema = z.object({ role: staffRoleField });
