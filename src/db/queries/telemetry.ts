// Named queries of the telemetry pipeline (device lookup, dead letters, latest state, events,
// readings for charts). The batch writer, which needs COPY and one transaction per batch, lives
// in src/lib/telemetry/writer.server.ts.
import { and, eq, sql } from 'drizzle-orm';
import { db } from '..';
import { deadLetters, tankLatestState, tanks } from '../schema';
import type { Scope } from '../../lib/server/authz';
import { isUuid, tankInScope } from './scope';

/** What the ingest side needs to know about a tank. */
export interface IngestTank {
  id: string;
  serial: string;
  companyId: string;
  sensorCount: number;
  volumeL: number;
  targetC: number;
}

const ingestColumns = {
  id: tanks.id,
  serial: tanks.serial,
  companyId: tanks.companyId,
  sensorCount: tanks.sensorCount,
  volumeL: tanks.volumeL,
  targetC: tanks.targetC,
};

export async function findIngestTankBySerial(serial: string): Promise<IngestTank | null> {
  const [row] = await db().select(ingestColumns).from(tanks).where(eq(tanks.serial, serial)).limit(1);
  return row ?? null;
}

export async function findIngestTankByTokenHash(hash: string): Promise<IngestTank | null> {
  const [row] = await db().select(ingestColumns).from(tanks).where(eq(tanks.deviceTokenHash, hash)).limit(1);
  return row ?? null;
}

/** The stored token hash of a serial, for the broker; null when the tank or its token is unknown. */
export async function findDeviceTokenHash(serial: string): Promise<string | null> {
  const [row] = await db().select({ hash: tanks.deviceTokenHash }).from(tanks).where(eq(tanks.serial, serial)).limit(1);
  return row?.hash ?? null;
}

/** A tank the viewer may see, or null (outside the company, or a householder's other homes). */
export async function findTankInScope(
  scope: Scope,
  tankId: string,
): Promise<{ id: string; serial: string; companyId: string; homeId: string | null; targetC: number } | null> {
  if (!isUuid(tankId)) return null;
  const [row] = await db()
    .select({
      id: tanks.id,
      serial: tanks.serial,
      companyId: tanks.companyId,
      homeId: tanks.homeId,
      targetC: tanks.targetC,
    })
    .from(tanks)
    .where(and(eq(tanks.id, tankId), tankInScope(scope)))
    .limit(1);
  return row ?? null;
}

/** Replaces a tank's device token hash (rotation); the old token stops working at once. */
export async function setDeviceTokenHash(
  tankId: string,
  hash: string,
  tx: Pick<ReturnType<typeof db>, 'update'> = db(),
): Promise<Date> {
  const issuedAt = new Date();
  await tx.update(tanks).set({ deviceTokenHash: hash, deviceTokenIssuedAt: issuedAt }).where(eq(tanks.id, tankId));
  return issuedAt;
}

export interface DeadLetterInput {
  tankId: string | null;
  serial: string | null;
  transport: 'mqtt' | 'http';
  topic: string | null;
  reasonCode: string;
  reason: string;
  fields: { field: string; message: string }[];
  payload: Buffer;
}

/** Largest payload kept in a dead letter; the size of the original is always recorded. */
const MAX_DEAD_LETTER_BYTES = 256 * 1024;

export async function insertDeadLetters(rows: readonly DeadLetterInput[]): Promise<void> {
  if (rows.length === 0) return;
  await db()
    .insert(deadLetters)
    .values(
      rows.map((r) => ({
        tankId: r.tankId,
        serial: r.serial,
        transport: r.transport,
        topic: r.topic,
        reasonCode: r.reasonCode,
        reason: r.reason,
        fields: r.fields,
        payload: r.payload.subarray(0, MAX_DEAD_LETTER_BYTES),
        payloadBytes: r.payload.length,
      })),
    );
}

/** Online/offline from the retained status topic. */
export async function recordTankStatus(tankId: string, online: boolean, at: Date): Promise<void> {
  await db()
    .insert(tankLatestState)
    .values({ tankId, online, statusAt: at, lastSeenAt: at })
    .onConflictDoUpdate({
      target: tankLatestState.tankId,
      set: { online, statusAt: at, lastSeenAt: sql`greatest(${tankLatestState.lastSeenAt}, excluded.last_seen_at)` },
    });
}

export async function getLatestState(tankId: string) {
  const [row] = await db().select().from(tankLatestState).where(eq(tankLatestState.tankId, tankId)).limit(1);
  return row ?? null;
}
