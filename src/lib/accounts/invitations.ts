import { getHomeInScope, homeLabel } from '../../db/queries/home-access';
import { createInvitation, isMemberByEmail } from '../../db/queries/invitations';
import { invitationMail } from '../mail/messages';
import { sendMail } from '../mail/send';
import { HttpError, scopeOf } from '../server/authz';
import { env } from '../server/env';
import type { Viewer } from '../server/viewer';
import { newLinkToken } from '../auth/tokens';
import type { HouseholderInvitationInput, StaffInvitationInput } from './schemas';

/** How long an invitation link works (common practice). */
export const INVITATION_DAYS = 7;

export function siteUrl(path: string): string {
  const base = env().AUTH_URL ?? `http://localhost:${env().PORT}`;
  return new URL(path, base).toString();
}

async function invite(
  viewer: Viewer,
  input: {
    email: string;
    name: string | null;
    role: StaffInvitationInput['role'] | 'householder';
    homeId: string | null;
    homeText: string | null;
  },
) {
  const { token, hash } = newLinkToken();
  const invitation = await createInvitation({
    companyId: viewer.companyId,
    email: input.email,
    name: input.name,
    role: input.role,
    homeId: input.homeId,
    invitedBy: viewer.userId,
    tokenHash: hash,
    expiresAt: new Date(Date.now() + INVITATION_DAYS * 86_400_000),
  });
  await sendMail({
    to: input.email,
    companyId: viewer.companyId,
    ...invitationMail({
      url: siteUrl(`/accept-invitation?token=${token}`),
      companyName: viewer.companyName,
      role: input.role,
      inviterName: viewer.name ?? viewer.email,
      homeLabel: input.homeText,
      days: INVITATION_DAYS,
    }),
  });
  return {
    id: invitation.id,
    email: invitation.email,
    role: invitation.role,
    homeId: invitation.homeId,
    expiresAt: invitation.expiresAt,
  };
}

/** An admin invites a member of staff with a role. */
export async function inviteStaff(viewer: Viewer, input: StaffInvitationInput) {
  if (await isMemberByEmail(viewer.companyId, input.email)) {
    throw new HttpError(
      409,
      'AlreadyMember',
      'That address already belongs to a member of your company. Change their role in the staff list instead.',
      [{ field: 'email', message: 'Already a member of your company.' }],
    );
  }
  return invite(viewer, {
    email: input.email,
    name: input.name ?? null,
    role: input.role,
    homeId: null,
    homeText: null,
  });
}

/** Staff invite the householder of one of the company's homes (at handover). */
export async function inviteHouseholder(viewer: Viewer, homeId: string, input: HouseholderInvitationInput) {
  const home = await getHomeInScope(scopeOf(viewer), homeId);
  if (!home) throw new HttpError(404, 'NotFound', 'There is no such home.');
  return invite(viewer, {
    email: input.email,
    name: input.name ?? null,
    role: 'householder',
    homeId: home.id,
    homeText: homeLabel(home),
  });
}
