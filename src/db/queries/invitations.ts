import { and, asc, desc, eq, gt, isNull, ne, sql } from 'drizzle-orm';
import { db } from '..';
import { companies, homeMembers, homes, invitations, memberships, users, type Invitation, type Role } from '../schema';
import { recordAudit } from './audit';
import { isUuid } from './scope';

export type InvitationState = 'pending' | 'accepted' | 'expired' | 'revoked';

export function invitationState(
  i: Pick<Invitation, 'acceptedAt' | 'revokedAt' | 'expiresAt'>,
  now = new Date(),
): InvitationState {
  if (i.acceptedAt) return 'accepted';
  if (i.revokedAt) return 'revoked';
  return i.expiresAt <= now ? 'expired' : 'pending';
}

export interface NewInvitation {
  companyId: string;
  email: string;
  name: string | null;
  role: Role;
  homeId: string | null;
  invitedBy: string;
  tokenHash: string;
  expiresAt: Date;
}

/** Stores an invitation and its audit entry together. */
export async function createInvitation(input: NewInvitation): Promise<Invitation> {
  return db().transaction(async (tx) => {
    const [row] = await tx.insert(invitations).values(input).returning();
    await recordAudit(
      {
        companyId: input.companyId,
        actorUserId: input.invitedBy,
        action: 'invitation.created',
        subject: input.email,
        detail: { invitationId: row.id, role: input.role, ...(input.homeId ? { homeId: input.homeId } : {}) },
      },
      tx,
    );
    return row;
  });
}

/** Whether the address already has any membership in this company. */
export async function isMemberByEmail(companyId: string, email: string): Promise<boolean> {
  const rows = await db()
    .select({ one: sql`1` })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.companyId, companyId), eq(sql`lower(${users.email})`, email.toLowerCase())));
  return rows.length > 0;
}

export interface InvitationView extends Invitation {
  companyName: string;
  inviterName: string | null;
  home: { reference: string; addressLine: string; town: string } | null;
  /** The invited address already has an account (no password to choose). */
  accountExists: boolean;
}

/** The invitation a link's token names, whatever its state, or null. */
export async function findInvitationByTokenHash(tokenHash: string): Promise<InvitationView | null> {
  const [row] = await db()
    .select({
      inv: invitations,
      companyName: companies.name,
      homeRef: homes.reference,
      homeAddress: homes.addressLine,
      homeTown: homes.town,
    })
    .from(invitations)
    .innerJoin(companies, eq(companies.id, invitations.companyId))
    .leftJoin(homes, eq(homes.id, invitations.homeId))
    .where(eq(invitations.tokenHash, tokenHash));
  if (!row) return null;
  const [inviter] = row.inv.invitedBy
    ? await db().select({ name: users.name, email: users.email }).from(users).where(eq(users.id, row.inv.invitedBy))
    : [];
  const [existing] = await db()
    .select({ id: users.id })
    .from(users)
    .where(eq(sql`lower(${users.email})`, row.inv.email.toLowerCase()));
  return {
    ...row.inv,
    companyName: row.companyName,
    inviterName: inviter ? (inviter.name ?? inviter.email) : null,
    home: row.homeRef ? { reference: row.homeRef, addressLine: row.homeAddress!, town: row.homeTown! } : null,
    accountExists: !!existing,
  };
}

export type AcceptOutcome =
  | {
      ok: true;
      user: { id: string; email: string; name: string | null };
      companyId: string;
      role: Role;
      created: boolean;
    }
  | { ok: false; reason: 'not_found' | 'used' | 'expired' | 'revoked' | 'other_company' | 'password_required' };

/**
 * Accepts an invitation in one transaction: marks it used (only if still pending: a link works
 * once, even when clicked twice at the same moment), creates or finds the account, gives it
 * the role, links the home.
 */
export async function acceptInvitation(
  tokenHash: string,
  input: { name: string | null; passwordHash: string | null },
): Promise<AcceptOutcome> {
  return db().transaction(async (tx) => {
    const [inv] = await tx.select().from(invitations).where(eq(invitations.tokenHash, tokenHash)).for('update');
    if (!inv) return { ok: false, reason: 'not_found' };
    const state = invitationState(inv);
    if (state === 'accepted') return { ok: false, reason: 'used' };
    if (state !== 'pending') return { ok: false, reason: state };

    let createdUser = false;
    let [user] = await tx
      .select()
      .from(users)
      .where(eq(sql`lower(${users.email})`, inv.email.toLowerCase()));
    if (user) {
      const elsewhere = await tx
        .select({ one: sql`1` })
        .from(memberships)
        .where(and(eq(memberships.userId, user.id), ne(memberships.companyId, inv.companyId)));
      if (elsewhere.length > 0) return { ok: false, reason: 'other_company' };
      await tx
        .update(users)
        .set({
          emailVerified: user.emailVerified ?? new Date(),
          ...(input.passwordHash && !user.passwordHash ? { passwordHash: input.passwordHash } : {}),
        })
        .where(eq(users.id, user.id));
    } else {
      if (!input.passwordHash) return { ok: false, reason: 'password_required' };
      [user] = await tx
        .insert(users)
        .values({
          email: inv.email,
          name: input.name ?? inv.name,
          passwordHash: input.passwordHash,
          emailVerified: new Date(),
        })
        .returning();
      createdUser = true;
    }

    const [current] = await tx
      .select()
      .from(memberships)
      .where(and(eq(memberships.userId, user.id), eq(memberships.companyId, inv.companyId)));
    // Staff invited as a householder keep their staff role: they already see every home.
    const role: Role =
      current && current.role !== 'householder' && inv.role === 'householder' ? current.role : inv.role;
    if (current)
      await tx
        .update(memberships)
        .set({ role })
        .where(and(eq(memberships.userId, user.id), eq(memberships.companyId, inv.companyId)));
    else await tx.insert(memberships).values({ userId: user.id, companyId: inv.companyId, role });
    if (inv.homeId) await tx.insert(homeMembers).values({ homeId: inv.homeId, userId: user.id }).onConflictDoNothing();

    await tx.update(invitations).set({ acceptedAt: new Date(), acceptedBy: user.id }).where(eq(invitations.id, inv.id));
    await recordAudit(
      {
        companyId: inv.companyId,
        actorUserId: user.id,
        action: 'invitation.accepted',
        subject: `user:${user.id}`,
        detail: { invitationId: inv.id, role, newAccount: createdUser, ...(inv.homeId ? { homeId: inv.homeId } : {}) },
      },
      tx,
    );
    return {
      ok: true,
      user: { id: user.id, email: user.email, name: user.name },
      companyId: inv.companyId,
      role,
      created: createdUser,
    };
  });
}

export interface PendingInvitation {
  id: string;
  email: string;
  name: string | null;
  role: Role;
  homeId: string | null;
  expiresAt: Date;
  createdAt: Date;
  invitedByEmail: string | null;
}

/** Invitations not yet accepted, withdrawn or expired: the company's, or one home's. */
export async function listPendingInvitations(
  companyId: string,
  opts: { homeId?: string } = {},
): Promise<PendingInvitation[]> {
  return db()
    .select({
      id: invitations.id,
      email: invitations.email,
      name: invitations.name,
      role: invitations.role,
      homeId: invitations.homeId,
      expiresAt: invitations.expiresAt,
      createdAt: invitations.createdAt,
      invitedByEmail: users.email,
    })
    .from(invitations)
    .leftJoin(users, eq(users.id, invitations.invitedBy))
    .where(
      and(
        eq(invitations.companyId, companyId),
        isNull(invitations.acceptedAt),
        isNull(invitations.revokedAt),
        gt(invitations.expiresAt, new Date()),
        opts.homeId ? eq(invitations.homeId, opts.homeId) : undefined,
      ),
    )
    .orderBy(desc(invitations.createdAt), asc(invitations.email));
}

/** Withdraws a pending invitation of the company; false when there is none with that id. */
export async function revokeInvitation(companyId: string, id: string, actorUserId: string): Promise<boolean> {
  if (!isUuid(id)) return false;
  return db().transaction(async (tx) => {
    const rows = await tx
      .update(invitations)
      .set({ revokedAt: new Date() })
      .where(
        and(
          eq(invitations.id, id),
          eq(invitations.companyId, companyId),
          isNull(invitations.acceptedAt),
          isNull(invitations.revokedAt),
        ),
      )
      .returning({ email: invitations.email });
    if (rows.length === 0) return false;
    await recordAudit(
      { companyId, actorUserId, action: 'invitation.revoked', subject: rows[0].email, detail: { invitationId: id } },
      tx,
    );
    return true;
  });
}
