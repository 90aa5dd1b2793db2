// Named queries of commissioning: heat-pump models, drafts, registration, sign-off, amendments,
// uploads and the bulk import of existing installs. Every query takes the company (or a Scope):
// a record of another company is simply not found.
import { randomBytes } from 'node:crypto';
import { and, asc, desc, eq, inArray, ne, sql } from 'drizzle-orm';
import { db } from '..';
import {
  commissioningAmendments,
  commissionings,
  heatPumpModels,
  homes,
  tankLatestState,
  tanks,
  uploads,
  users,
  type Commissioning,
  type CommissioningAmendment,
  type HeatPumpModel,
  type NewTank,
  type Upload,
} from '../schema';
import type { Scope } from '../../lib/server/authz';
import type { CommissioningAnswers, StepId } from '../../lib/commissioning/steps';
import { recordAudit } from './audit';
import { inScope, isUuid } from './scope';

// ---- heat-pump models (kept by admins) ----

export async function listHeatPumpModels(companyId: string): Promise<HeatPumpModel[]> {
  return db()
    .select()
    .from(heatPumpModels)
    .where(eq(heatPumpModels.companyId, companyId))
    .orderBy(asc(heatPumpModels.name));
}

export async function findHeatPumpModel(companyId: string, id: string): Promise<HeatPumpModel | null> {
  if (!isUuid(id)) return null;
  const [row] = await db()
    .select()
    .from(heatPumpModels)
    .where(and(eq(heatPumpModels.companyId, companyId), eq(heatPumpModels.id, id)));
  return row ?? null;
}

export type NewHeatPumpModel = Pick<HeatPumpModel, 'name' | 'outputW' | 'ntcR25Ohm' | 'ntcBetaK'>;

/** Adds a model; null when the company already has one of that name. */
export async function createHeatPumpModel(
  companyId: string,
  actorUserId: string,
  input: NewHeatPumpModel,
): Promise<HeatPumpModel | null> {
  return db().transaction(async (tx) => {
    const [row] = await tx
      .insert(heatPumpModels)
      .values({ ...input, companyId, createdBy: actorUserId })
      .onConflictDoNothing()
      .returning();
    if (!row) return null;
    await recordAudit(
      {
        companyId,
        actorUserId,
        action: 'heat_pump_model.created',
        subject: `heat_pump_model:${row.id}`,
        detail: { name: row.name },
      },
      tx,
    );
    return row;
  });
}

export async function deleteHeatPumpModel(companyId: string, id: string, actorUserId: string): Promise<boolean> {
  if (!isUuid(id)) return false;
  return db().transaction(async (tx) => {
    const rows = await tx
      .delete(heatPumpModels)
      .where(and(eq(heatPumpModels.companyId, companyId), eq(heatPumpModels.id, id)))
      .returning({ name: heatPumpModels.name });
    if (rows.length === 0) return false;
    await recordAudit(
      {
        companyId,
        actorUserId,
        action: 'heat_pump_model.deleted',
        subject: `heat_pump_model:${id}`,
        detail: { name: rows[0].name },
      },
      tx,
    );
    return true;
  });
}

// ---- drafts ----

export interface CommissioningSummary {
  id: string;
  status: Commissioning['status'];
  step: string;
  updatedAt: Date;
  signedAt: Date | null;
  serial: string | null;
  address: string | null;
  engineerEmail: string | null;
  tankId: string | null;
}

export async function listCommissionings(companyId: string, limit = 200): Promise<CommissioningSummary[]> {
  const rows = await db()
    .select({ c: commissionings, engineerEmail: users.email })
    .from(commissionings)
    .leftJoin(users, eq(users.id, commissionings.engineerUserId))
    .where(eq(commissionings.companyId, companyId))
    .orderBy(desc(commissionings.updatedAt))
    .limit(limit);
  return rows.map(({ c, engineerEmail }) => {
    const data = c.data as Partial<Record<StepId, Record<string, unknown>>>;
    const home = data.home;
    return {
      id: c.id,
      status: c.status,
      step: c.step,
      updatedAt: c.updatedAt,
      signedAt: c.signedAt,
      tankId: c.tankId,
      serial: (data.cylinder?.serial as string | undefined) ?? null,
      address: home?.addressLine ? `${home.addressLine}, ${home.town ?? ''}` : null,
      engineerEmail,
    };
  });
}

export async function createDraft(companyId: string, engineerUserId: string): Promise<Commissioning> {
  const [row] = await db().insert(commissionings).values({ companyId, engineerUserId }).returning();
  return row;
}

export async function getCommissioning(companyId: string, id: string): Promise<Commissioning | null> {
  if (!isUuid(id)) return null;
  const [row] = await db()
    .select()
    .from(commissionings)
    .where(and(eq(commissionings.companyId, companyId), eq(commissionings.id, id)));
  return row ?? null;
}

/** The signed record of a tank the scope may see (householders: their own homes'), or null. */
export async function getCommissioningForTank(scope: Scope, tankId: string): Promise<Commissioning | null> {
  if (!isUuid(tankId)) return null;
  const [row] = await db()
    .select()
    .from(commissionings)
    .where(and(inScope(scope, commissionings.companyId, commissionings.homeId), eq(commissionings.tankId, tankId)));
  return row ?? null;
}

export type SaveOutcome = { ok: true; row: Commissioning } | { ok: false; reason: 'not_found' | 'locked' };

/** Saves one step's answers into the draft (refused once the record is signed). */
export async function saveDraftStep(
  companyId: string,
  id: string,
  step: StepId,
  value: unknown,
  nextStep: StepId,
): Promise<SaveOutcome> {
  if (!isUuid(id)) return { ok: false, reason: 'not_found' };
  return db().transaction(async (tx) => {
    const [row] = await tx
      .select()
      .from(commissionings)
      .where(and(eq(commissionings.companyId, companyId), eq(commissionings.id, id)))
      .for('update');
    if (!row) return { ok: false, reason: 'not_found' };
    if (row.status === 'signed') return { ok: false, reason: 'locked' };
    const [updated] = await tx
      .update(commissionings)
      .set({ data: { ...row.data, [step]: value }, step: nextStep, updatedAt: new Date() })
      .where(eq(commissionings.id, id))
      .returning();
    return { ok: true, row: updated };
  });
}

/** Whether another tank (anywhere: serials are unique across Heatlayer) already has this serial. */
export async function serialTaken(serial: string, exceptTankId: string | null): Promise<boolean> {
  const rows = await db()
    .select({ id: tanks.id })
    .from(tanks)
    .where(and(sql`lower(${tanks.serial}) = lower(${serial})`, exceptTankId ? ne(tanks.id, exceptTankId) : undefined))
    .limit(1);
  return rows.length > 0;
}

/** Home reference for a new install: unique within the company, readable on the phone. */
const newReference = () => `INS-${randomBytes(3).toString('hex').toUpperCase()}`;

function tankValues(a: Pick<CommissioningAnswers, 'cylinder' | 'heat_source' | 'target'>): Omit<NewTank, 'companyId'> {
  return {
    serial: a.cylinder.serial,
    model: a.cylinder.model,
    volumeL: a.cylinder.volumeL,
    heightM: a.cylinder.heightM,
    sensorCount: a.cylinder.sensorCount,
    sensorHeightsM: a.cylinder.sensorHeightsM ?? null,
    heatSource: a.heat_source.heatSource,
    hpOutputW: a.heat_source.hpOutputW ?? 0,
    immersionW: a.cylinder.immersionW,
    declaredLossW: a.cylinder.declaredLossW ?? null,
    targetC: a.target.targetC,
    hysteresisK: a.target.hysteresisK,
  };
}

function homeValues(a: Pick<CommissioningAnswers, 'home'>) {
  return {
    addressLine: a.home.addressLine,
    town: a.home.town,
    postcode: a.home.postcode,
    occupants: a.home.occupants,
    contactName: a.home.contactName,
    contactEmail: a.home.contactEmail,
  };
}

export type RegisterOutcome =
  | { ok: true; homeId: string; tankId: string }
  | { ok: false; reason: 'not_found' | 'locked' | 'serial_taken' };

/**
 * Creates (or updates) the draft's home and tank and gives the tank a new device token hash, in
 * one transaction, so the tank can report for its connection check.
 */
export async function registerInstall(
  companyId: string,
  id: string,
  answers: Pick<CommissioningAnswers, 'home' | 'cylinder' | 'heat_source' | 'target'>,
  tokenHash: string,
  actorUserId: string,
): Promise<RegisterOutcome> {
  return db().transaction(async (tx) => {
    const [row] = await tx
      .select()
      .from(commissionings)
      .where(and(eq(commissionings.companyId, companyId), eq(commissionings.id, id)))
      .for('update');
    if (!row) return { ok: false, reason: 'not_found' };
    if (row.status === 'signed') return { ok: false, reason: 'locked' };
    const taken = await tx
      .select({ id: tanks.id })
      .from(tanks)
      .where(
        and(
          sql`lower(${tanks.serial}) = lower(${answers.cylinder.serial})`,
          row.tankId ? ne(tanks.id, row.tankId) : undefined,
        ),
      )
      .limit(1);
    if (taken.length) return { ok: false, reason: 'serial_taken' };

    let homeId = row.homeId;
    if (homeId)
      await tx
        .update(homes)
        .set(homeValues(answers))
        .where(and(eq(homes.id, homeId), eq(homes.companyId, companyId)));
    else
      [{ id: homeId }] = await tx
        .insert(homes)
        .values({ companyId, reference: newReference(), ...homeValues(answers) })
        .returning({ id: homes.id });

    const now = new Date();
    const values = { ...tankValues(answers), homeId, deviceTokenHash: tokenHash, deviceTokenIssuedAt: now };
    let tankId = row.tankId;
    if (tankId)
      await tx
        .update(tanks)
        .set(values)
        .where(and(eq(tanks.id, tankId), eq(tanks.companyId, companyId)));
    else
      [{ id: tankId }] = await tx
        .insert(tanks)
        .values({ companyId, ...values })
        .returning({ id: tanks.id });

    await tx
      .update(commissionings)
      .set({ homeId, tankId, step: 'connection', updatedAt: now })
      .where(eq(commissionings.id, id));
    await recordAudit(
      {
        companyId,
        actorUserId,
        action: 'commissioning.registered',
        subject: `tank:${tankId}`,
        detail: { commissioningId: id, serial: answers.cylinder.serial },
      },
      tx,
    );
    return { ok: true, homeId: homeId!, tankId: tankId! };
  });
}

/** The newest telemetry of a tank (null until its first reading arrives). */
export async function latestTelemetry(tankId: string) {
  const [row] = await db()
    .select({
      ts: tankLatestState.ts,
      layersCc: tankLatestState.layersCc,
      v40L: tankLatestState.v40L,
      soc: tankLatestState.soc,
      online: tankLatestState.online,
    })
    .from(tankLatestState)
    .where(eq(tankLatestState.tankId, tankId));
  return row?.ts && row.layersCc
    ? {
        ts: row.ts,
        layersC: row.layersCc.map((c) => (c === null ? null : c / 100)),
        v40L: row.v40L,
        soc: row.soc,
        online: row.online,
      }
    : null;
}

export type SignOutcome =
  | { ok: true; row: Commissioning }
  | { ok: false; reason: 'not_found' | 'locked' | 'not_registered' };

/**
 * Locks the record: the final answers go onto the tank and home, the record is frozen as signed,
 * all in one transaction (a second sign-off finds it locked).
 */
export async function signOffRecord(
  companyId: string,
  id: string,
  answers: CommissioningAnswers,
  record: Record<string, unknown>,
  actorUserId: string,
): Promise<SignOutcome> {
  return db().transaction(async (tx) => {
    const [row] = await tx
      .select()
      .from(commissionings)
      .where(and(eq(commissionings.companyId, companyId), eq(commissionings.id, id)))
      .for('update');
    if (!row) return { ok: false, reason: 'not_found' };
    if (row.status === 'signed') return { ok: false, reason: 'locked' };
    if (!row.tankId || !row.homeId) return { ok: false, reason: 'not_registered' };
    const now = new Date();
    await tx
      .update(homes)
      .set(homeValues(answers))
      .where(and(eq(homes.id, row.homeId), eq(homes.companyId, companyId)));
    await tx
      .update(tanks)
      .set({ ...tankValues(answers), commissionedAt: now })
      .where(and(eq(tanks.id, row.tankId), eq(tanks.companyId, companyId)));
    const [signed] = await tx
      .update(commissionings)
      .set({ status: 'signed', step: 'signoff', record, signedAt: now, signedBy: actorUserId, updatedAt: now })
      .where(eq(commissionings.id, id))
      .returning();
    await recordAudit(
      {
        companyId,
        actorUserId,
        action: 'commissioning.signed',
        subject: `tank:${row.tankId}`,
        detail: { commissioningId: id, serial: answers.cylinder.serial },
      },
      tx,
    );
    return { ok: true, row: signed };
  });
}

export async function setRecordDocument(id: string, pdfKey: string): Promise<void> {
  await db().update(commissionings).set({ pdfKey }).where(eq(commissionings.id, id));
}

export async function markHandoverSent(id: string, at = new Date()): Promise<void> {
  await db().update(commissionings).set({ handoverSentAt: at }).where(eq(commissionings.id, id));
}

// ---- amendments ----

export type AmendmentRow = CommissioningAmendment & { userEmail: string | null };

export async function listAmendments(commissioningId: string): Promise<AmendmentRow[]> {
  const rows = await db()
    .select({ a: commissioningAmendments, userEmail: users.email })
    .from(commissioningAmendments)
    .leftJoin(users, eq(users.id, commissioningAmendments.userId))
    .where(eq(commissioningAmendments.commissioningId, commissioningId))
    .orderBy(asc(commissioningAmendments.createdAt));
  return rows.map((r) => ({ ...r.a, userEmail: r.userEmail }));
}

export type AmendOutcome =
  | { ok: true; amendment: CommissioningAmendment }
  | { ok: false; reason: 'not_found' | 'not_signed' };

/** Records an amendment to a signed record and, for a field the tank runs on, updates the tank too. */
export async function addAmendment(input: {
  companyId: string;
  commissioningId: string;
  field: string;
  oldValue: unknown;
  newValue: unknown;
  reason: string;
  actorUserId: string;
  tankColumn?: 'targetC' | 'hysteresisK' | 'declaredLossW';
}): Promise<AmendOutcome> {
  return db().transaction(async (tx) => {
    const [row] = await tx
      .select()
      .from(commissionings)
      .where(and(eq(commissionings.companyId, input.companyId), eq(commissionings.id, input.commissioningId)))
      .for('update');
    if (!row) return { ok: false, reason: 'not_found' };
    if (row.status !== 'signed') return { ok: false, reason: 'not_signed' };
    const [amendment] = await tx
      .insert(commissioningAmendments)
      .values({
        commissioningId: row.id,
        companyId: input.companyId,
        field: input.field,
        oldValue: input.oldValue ?? null,
        newValue: input.newValue ?? null,
        reason: input.reason,
        userId: input.actorUserId,
      })
      .returning();
    if (input.tankColumn && row.tankId)
      await tx
        .update(tanks)
        .set({ [input.tankColumn]: input.newValue })
        .where(eq(tanks.id, row.tankId));
    await recordAudit(
      {
        companyId: input.companyId,
        actorUserId: input.actorUserId,
        action: 'commissioning.amended',
        subject: row.tankId ? `tank:${row.tankId}` : null,
        detail: { commissioningId: row.id, field: input.field },
      },
      tx,
    );
    return { ok: true, amendment };
  });
}

// ---- uploads ----

export type NewUpload = Omit<Upload, 'id' | 'createdAt'>;

export async function insertUpload(values: NewUpload): Promise<Upload> {
  const [row] = await db().insert(uploads).values(values).returning();
  return row;
}

/** An upload the scope may see: the company's, and for householders only their own homes' tanks. */
export async function findUploadInScope(scope: Scope, id: string): Promise<Upload | null> {
  if (!isUuid(id)) return null;
  // An upload belongs to the home of its tank, or of its commissioning before the tank exists.
  const home = sql`coalesce(${tanks.homeId}, ${commissionings.homeId})`;
  const rows = await db()
    .select({ u: uploads })
    .from(uploads)
    .leftJoin(tanks, eq(tanks.id, uploads.tankId))
    .leftJoin(commissionings, eq(commissionings.id, uploads.commissioningId))
    .where(and(eq(uploads.id, id), inScope(scope, uploads.companyId, home)));
  return rows[0]?.u ?? null;
}

export async function listUploads(
  companyId: string,
  by: { commissioningId?: string; tankId?: string; visitId?: string },
): Promise<Upload[]> {
  const cond = by.commissioningId
    ? eq(uploads.commissioningId, by.commissioningId)
    : by.visitId
      ? eq(uploads.visitId, by.visitId)
      : by.tankId
        ? eq(uploads.tankId, by.tankId)
        : sql`false`;
  return db()
    .select()
    .from(uploads)
    .where(and(eq(uploads.companyId, companyId), cond))
    .orderBy(asc(uploads.createdAt));
}

// ---- bulk import of existing installs ----

export interface ImportRow {
  home: {
    reference: string;
    addressLine: string;
    town: string;
    postcode: string;
    occupants: number;
    contactName: string | null;
    contactEmail: string | null;
  };
  tank: Omit<NewTank, 'companyId' | 'homeId'>;
}

/** Serials of these that any tank already has, and home references the company already uses. */
export async function existingKeys(
  companyId: string,
  serials: string[],
  references: string[],
): Promise<{ serials: Set<string>; references: Set<string> }> {
  const lower = serials.map((s) => s.toLowerCase());
  const [s, r] = await Promise.all([
    lower.length
      ? db()
          .select({ serial: tanks.serial })
          .from(tanks)
          .where(inArray(sql`lower(${tanks.serial})`, lower))
      : Promise.resolve([]),
    references.length
      ? db()
          .select({ reference: homes.reference })
          .from(homes)
          .where(and(eq(homes.companyId, companyId), inArray(homes.reference, references)))
      : Promise.resolve([]),
  ]);
  return { serials: new Set(s.map((x) => x.serial.toLowerCase())), references: new Set(r.map((x) => x.reference)) };
}

/** Imports every row in one transaction: all of them, or (on any failure) none. */
export async function importInstalls(
  companyId: string,
  rows: readonly ImportRow[],
  actorUserId: string,
): Promise<{ homes: number; tanks: number }> {
  return db().transaction(async (tx) => {
    const insertedHomes = await tx
      .insert(homes)
      .values(rows.map((r) => ({ companyId, ...r.home })))
      .returning({ id: homes.id, reference: homes.reference });
    const idByRef = new Map(insertedHomes.map((h) => [h.reference, h.id]));
    await tx.insert(tanks).values(rows.map((r) => ({ companyId, homeId: idByRef.get(r.home.reference)!, ...r.tank })));
    await recordAudit(
      {
        companyId,
        actorUserId,
        action: 'installs.imported',
        detail: { homes: insertedHomes.length, tanks: rows.length },
      },
      tx,
    );
    return { homes: insertedHomes.length, tanks: rows.length };
  });
}
