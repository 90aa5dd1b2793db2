// Named queries of service visits: the desk's list of inspections due, one tank's history, and
// recording a visit (with its photos) in one transaction.
import { and, asc, desc, eq, inArray, isNotNull, isNull, sql } from 'drizzle-orm';
import { db } from '..';
import { homes, serviceVisits, tanks, uploads, users, type ServiceVisit, type VisitKind, type VisitPart, type VisitReadings } from '../schema';
import { INSPECTION_INTERVAL_MONTHS } from '../../lib/commissioning/service-due';
import { recordAudit } from './audit';
import { isUuid } from './scope';

export interface DueRow {
  tankId: string; serial: string; model: string; homeId: string | null; reference: string | null; addressLine: string | null; town: string | null;
  commissionedAt: Date; lastInspection: Date | null; lastVisit: Date | null; dueAt: Date;
}

/** Commissioned tanks whose annual inspection falls due before `until`, soonest (most overdue) first. */
export async function listInspectionsDue(companyId: string, until: Date, limit = 500): Promise<DueRow[]> {
  const last = db().select({
    tankId: serviceVisits.tankId,
    lastInspection: sql<Date | null>`max(${serviceVisits.visitedAt}) filter (where ${serviceVisits.kind} = 'annual_inspection')`.as('last_inspection'),
    lastVisit: sql<Date | null>`max(${serviceVisits.visitedAt})`.as('last_visit'),
  }).from(serviceVisits).where(eq(serviceVisits.companyId, companyId)).groupBy(serviceVisits.tankId).as('last');
  const due = sql<Date>`(coalesce(${last.lastInspection}, ${tanks.commissionedAt}) + make_interval(months => ${INSPECTION_INTERVAL_MONTHS}))`;
  const rows = await db().select({
    tankId: tanks.id, serial: tanks.serial, model: tanks.model, homeId: tanks.homeId, reference: homes.reference, addressLine: homes.addressLine, town: homes.town,
    commissionedAt: tanks.commissionedAt, lastInspection: last.lastInspection, lastVisit: last.lastVisit, dueAt: due,
  }).from(tanks)
    .leftJoin(homes, eq(homes.id, tanks.homeId))
    .leftJoin(last, eq(last.tankId, tanks.id))
    .where(and(eq(tanks.companyId, companyId), isNotNull(tanks.commissionedAt), sql`${due} <= ${until.toISOString()}::timestamptz`))
    .orderBy(asc(due), asc(tanks.serial)).limit(limit);
  const date = (v: unknown) => (v === null || v === undefined ? null : new Date(v as string));
  return rows.map((r) => ({ ...r, commissionedAt: r.commissionedAt!, lastInspection: date(r.lastInspection), lastVisit: date(r.lastVisit), dueAt: new Date(r.dueAt as unknown as string) }));
}

export type VisitRow = ServiceVisit & { engineerEmail: string | null };

export async function listVisitsForTank(companyId: string, tankId: string): Promise<VisitRow[]> {
  if (!isUuid(tankId)) return [];
  const rows = await db().select({ v: serviceVisits, engineerEmail: users.email }).from(serviceVisits)
    .leftJoin(users, eq(users.id, serviceVisits.engineerUserId))
    .where(and(eq(serviceVisits.companyId, companyId), eq(serviceVisits.tankId, tankId)))
    .orderBy(desc(serviceVisits.visitedAt));
  return rows.map((r) => ({ ...r.v, engineerEmail: r.engineerEmail }));
}

export async function getVisit(companyId: string, id: string): Promise<VisitRow | null> {
  if (!isUuid(id)) return null;
  const [r] = await db().select({ v: serviceVisits, engineerEmail: users.email }).from(serviceVisits)
    .leftJoin(users, eq(users.id, serviceVisits.engineerUserId))
    .where(and(eq(serviceVisits.companyId, companyId), eq(serviceVisits.id, id)));
  return r ? { ...r.v, engineerEmail: r.engineerEmail } : null;
}

export interface NewVisit {
  companyId: string; tankId: string; kind: VisitKind; visitedAt: Date; engineerUserId: string; findings: string;
  parts: VisitPart[]; readings: VisitReadings; resolvedAlerts: string[]; uploadIds: string[];
}

export type VisitOutcome = { ok: true; visit: ServiceVisit } | { ok: false; reason: 'uploads'; missing: string[] };

/** Records a visit and attaches its photos (uploads of the same tank not yet on another visit), all or nothing. */
export async function createVisit(v: NewVisit): Promise<VisitOutcome> {
  return db().transaction(async (tx) => {
    if (v.uploadIds.length) {
      const usable = await tx.select({ id: uploads.id }).from(uploads)
        .where(and(inArray(uploads.id, v.uploadIds), eq(uploads.companyId, v.companyId), eq(uploads.tankId, v.tankId), isNull(uploads.visitId)))
        .for('update');
      const found = new Set(usable.map((u) => u.id));
      const missing = v.uploadIds.filter((id) => !found.has(id));
      if (missing.length) return { ok: false, reason: 'uploads', missing };
    }
    const [visit] = await tx.insert(serviceVisits).values({
      companyId: v.companyId, tankId: v.tankId, kind: v.kind, visitedAt: v.visitedAt, engineerUserId: v.engineerUserId,
      findings: v.findings, parts: v.parts, readings: v.readings, resolvedAlerts: v.resolvedAlerts,
    }).returning();
    if (v.uploadIds.length) await tx.update(uploads).set({ visitId: visit.id }).where(inArray(uploads.id, v.uploadIds));
    await recordAudit({ companyId: v.companyId, actorUserId: v.engineerUserId, action: 'service_visit.recorded', subject: `tank:${v.tankId}`, detail: { visitId: visit.id, kind: v.kind } }, tx);
    return { ok: true, visit };
  });
}
