// Named queries of service visits: the desk's list of inspections due, one tank's history, and
// recording a visit (with its photos) in one transaction.
import { and, asc, desc, eq, inArray, isNotNull, isNull, ne, sql } from 'drizzle-orm';
import { db } from '..';
import {
  alerts,
  homes,
  serviceVisits,
  tanks,
  uploads,
  users,
  type AlertRow,
  type ServiceVisit,
  type VisitKind,
  type VisitPart,
  type VisitReadings,
} from '../schema';
import { INSPECTION_INTERVAL_MONTHS } from '../../lib/commissioning/service-due';
import { recordAudit } from './audit';
import { isUuid } from './scope';

export interface DueRow {
  tankId: string;
  serial: string;
  model: string;
  homeId: string | null;
  reference: string | null;
  addressLine: string | null;
  town: string | null;
  commissionedAt: Date;
  lastInspection: Date | null;
  lastVisit: Date | null;
  dueAt: Date;
}

/** Commissioned tanks whose annual inspection falls due before `until`, soonest (most overdue) first. */
export async function listInspectionsDue(companyId: string, until: Date, limit = 500): Promise<DueRow[]> {
  const last = db()
    .select({
      tankId: serviceVisits.tankId,
      lastInspection:
        sql<Date | null>`max(${serviceVisits.visitedAt}) filter (where ${serviceVisits.kind} = 'annual_inspection')`.as(
          'last_inspection',
        ),
      lastVisit: sql<Date | null>`max(${serviceVisits.visitedAt})`.as('last_visit'),
    })
    .from(serviceVisits)
    .where(eq(serviceVisits.companyId, companyId))
    .groupBy(serviceVisits.tankId)
    .as('last');
  const due = sql<Date>`(coalesce(${last.lastInspection}, ${tanks.commissionedAt}) + make_interval(months => ${INSPECTION_INTERVAL_MONTHS}))`;
  const rows = await db()
    .select({
      tankId: tanks.id,
      serial: tanks.serial,
      model: tanks.model,
      homeId: tanks.homeId,
      reference: homes.reference,
      addressLine: homes.addressLine,
      town: homes.town,
      commissionedAt: tanks.commissionedAt,
      lastInspection: last.lastInspection,
      lastVisit: last.lastVisit,
      dueAt: due,
    })
    .from(tanks)
    .leftJoin(homes, eq(homes.id, tanks.homeId))
    .leftJoin(last, eq(last.tankId, tanks.id))
    .where(
      and(
        eq(tanks.companyId, companyId),
        isNotNull(tanks.commissionedAt),
        sql`${due} <= ${until.toISOString()}::timestamptz`,
      ),
    )
    .orderBy(asc(due), asc(tanks.serial))
    .limit(limit);
  const date = (v: unknown) => (v === null || v === undefined ? null : new Date(v as string));
  return rows.map((r) => ({
    ...r,
    commissionedAt: r.commissionedAt!,
    lastInspection: date(r.lastInspection),
    lastVisit: date(r.lastVisit),
    dueAt: new Date(r.dueAt as unknown as string),
  }));
}

export type VisitRow = ServiceVisit & { engineerEmail: string | null };

export async function listVisitsForTank(companyId: string, tankId: string): Promise<VisitRow[]> {
  if (!isUuid(tankId)) return [];
  const rows = await db()
    .select({ v: serviceVisits, engineerEmail: users.email })
    .from(serviceVisits)
    .leftJoin(users, eq(users.id, serviceVisits.engineerUserId))
    .where(and(eq(serviceVisits.companyId, companyId), eq(serviceVisits.tankId, tankId)))
    .orderBy(desc(serviceVisits.visitedAt));
  return rows.map((r) => ({ ...r.v, engineerEmail: r.engineerEmail }));
}

export async function getVisit(companyId: string, id: string): Promise<VisitRow | null> {
  if (!isUuid(id)) return null;
  const [r] = await db()
    .select({ v: serviceVisits, engineerEmail: users.email })
    .from(serviceVisits)
    .leftJoin(users, eq(users.id, serviceVisits.engineerUserId))
    .where(and(eq(serviceVisits.companyId, companyId), eq(serviceVisits.id, id)));
  return r ? { ...r.v, engineerEmail: r.engineerEmail } : null;
}

export interface NewVisit {
  companyId: string;
  tankId: string;
  kind: VisitKind;
  visitedAt: Date;
  engineerUserId: string;
  findings: string;
  parts: VisitPart[];
  readings: VisitReadings;
  resolvedAlertIds: string[];
  uploadIds: string[];
}

export type VisitOutcome =
  | { ok: true; visit: ServiceVisit }
  | { ok: false; reason: 'uploads' | 'alerts'; missing: string[] };

/** Records a visit and attaches its photos (uploads of the same tank not yet on another visit), all or nothing. */
export async function createVisit(v: NewVisit): Promise<VisitOutcome> {
  return db().transaction(async (tx) => {
    if (v.uploadIds.length) {
      const usable = await tx
        .select({ id: uploads.id })
        .from(uploads)
        .where(
          and(
            inArray(uploads.id, v.uploadIds),
            eq(uploads.companyId, v.companyId),
            eq(uploads.tankId, v.tankId),
            isNull(uploads.visitId),
          ),
        )
        .for('update');
      const found = new Set(usable.map((u) => u.id));
      const missing = v.uploadIds.filter((id) => !found.has(id));
      if (missing.length) return { ok: false, reason: 'uploads', missing };
    }
    if (v.resolvedAlertIds.length) {
      const open = await tx
        .select({ id: alerts.id })
        .from(alerts)
        .where(
          and(
            inArray(alerts.id, v.resolvedAlertIds),
            eq(alerts.companyId, v.companyId),
            eq(alerts.tankId, v.tankId),
            ne(alerts.state, 'resolved'),
          ),
        )
        .for('update');
      const found = new Set(open.map((a) => a.id));
      const missing = v.resolvedAlertIds.filter((id) => !found.has(id));
      if (missing.length) return { ok: false, reason: 'alerts', missing };
    }
    const [visit] = await tx
      .insert(serviceVisits)
      .values({
        companyId: v.companyId,
        tankId: v.tankId,
        kind: v.kind,
        visitedAt: v.visitedAt,
        engineerUserId: v.engineerUserId,
        findings: v.findings,
        parts: v.parts,
        readings: v.readings,
        resolvedAlerts: v.resolvedAlertIds,
      })
      .returning();
    if (v.resolvedAlertIds.length) {
      const at = new Date();
      await tx
        .update(alerts)
        .set({
          state: 'resolved',
          resolvedAt: at,
          resolvedBy: v.engineerUserId,
          note: sql`coalesce(${alerts.note}, ${`Resolved at a service visit on ${at.toISOString().slice(0, 10)}.`})`,
          updatedAt: at,
        })
        .where(inArray(alerts.id, v.resolvedAlertIds));
    }
    if (v.uploadIds.length) await tx.update(uploads).set({ visitId: visit.id }).where(inArray(uploads.id, v.uploadIds));
    await recordAudit(
      {
        companyId: v.companyId,
        actorUserId: v.engineerUserId,
        action: 'service_visit.recorded',
        subject: `tank:${v.tankId}`,
        detail: { visitId: visit.id, kind: v.kind },
      },
      tx,
    );
    return { ok: true, visit };
  });
}

export type TankAlert = Pick<AlertRow, 'id' | 'kind' | 'severity' | 'state' | 'openedAt' | 'resolvedAt'> & {
  summary: string;
};

const alertColumns = {
  id: alerts.id,
  kind: alerts.kind,
  severity: alerts.severity,
  state: alerts.state,
  openedAt: alerts.openedAt,
  resolvedAt: alerts.resolvedAt,
  evidence: alerts.evidence,
};
const withSummary = (rows: (Omit<TankAlert, 'summary'> & { evidence: { summary?: string } })[]): TankAlert[] =>
  rows.map(({ evidence, ...a }) => ({ ...a, summary: evidence?.summary ?? '' }));

/** The tank's alerts not yet resolved, for the visit form to resolve. */
export async function openAlertsForTank(companyId: string, tankId: string): Promise<TankAlert[]> {
  if (!isUuid(tankId)) return [];
  return withSummary(
    await db()
      .select(alertColumns)
      .from(alerts)
      .where(and(eq(alerts.companyId, companyId), eq(alerts.tankId, tankId), ne(alerts.state, 'resolved')))
      .orderBy(asc(alerts.openedAt)),
  );
}

/** Alerts by id (those a visit resolved), for its history. */
export async function alertsByIds(companyId: string, ids: readonly string[]): Promise<TankAlert[]> {
  const valid = ids.filter(isUuid);
  if (!valid.length) return [];
  return withSummary(
    await db()
      .select(alertColumns)
      .from(alerts)
      .where(and(eq(alerts.companyId, companyId), inArray(alerts.id, valid))),
  );
}
