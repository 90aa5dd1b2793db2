import { and, desc, eq, lt, sql } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import { db } from '..';
import { auditLog, users, type AuditEntry } from '../schema';

export interface AuditRecord {
  /** The company the event belongs to; null when it belongs to none (e.g. an unknown address). */
  companyId: string | null;
  /** Who did it; null for the system or someone not signed in. */
  actorUserId: string | null;
  /** Dotted, past tense: 'signin.succeeded', 'member.role_changed', 'device_token.rotated', 'command.sent'. */
  action: string;
  /** What it was done to: 'user:<id>', 'tank:<id>', 'invitation:<id>', or an e-mail address. */
  subject?: string | null;
  /** Anything else worth keeping (never a secret, a token or a password). */
  detail?: Record<string, unknown>;
}

/** Appends one entry to the audit log. Pass a transaction to keep it atomic with the change. */
export async function recordAudit(entry: AuditRecord, tx: Pick<ReturnType<typeof db>, 'insert'> = db()): Promise<void> {
  await tx.insert(auditLog).values({
    companyId: entry.companyId,
    actorUserId: entry.actorUserId,
    action: entry.action,
    subject: entry.subject ?? null,
    detail: entry.detail ?? {},
  });
}

export type AuditRow = AuditEntry & {
  actorEmail: string | null;
  actorName: string | null;
  subjectEmail: string | null;
};

const subjectUser = alias(users, 'subject_user');

/** A company's audit log, newest first, `limit` entries older than `beforeId`. */
export async function listAudit(
  companyId: string,
  opts: { limit?: number; beforeId?: number } = {},
): Promise<AuditRow[]> {
  const rows = await db()
    .select({ entry: auditLog, actorEmail: users.email, actorName: users.name, subjectEmail: subjectUser.email })
    .from(auditLog)
    .leftJoin(users, eq(users.id, auditLog.actorUserId))
    .leftJoin(subjectUser, eq(auditLog.subject, sql`'user:' || ${subjectUser.id}`))
    .where(and(eq(auditLog.companyId, companyId), opts.beforeId ? lt(auditLog.id, opts.beforeId) : undefined))
    .orderBy(desc(auditLog.id))
    .limit(Math.min(opts.limit ?? 50, 500));
  return rows.map((r) => ({
    ...r.entry,
    actorEmail: r.actorEmail,
    actorName: r.actorName,
    subjectEmail: r.subjectEmail,
  }));
}
