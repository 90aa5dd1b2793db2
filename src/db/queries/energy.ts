// Named queries of energy and planning: tariffs (company defaults and a home's own) and what the
// accounting and the planner read about a tank.
import { and, asc, desc, eq, gte, isNull, lt, or } from 'drizzle-orm';
import { db } from '..';
import { homes, readings, tanks, tariffs, telemetryEvents, type TariffRow } from '../schema';
import type { Tariff } from '../../lib/energy';
import type { Scope } from '../../lib/server/authz';
import { homeInScope, isUuid, tankInScope } from './scope';

/** A home of the viewer's scope, or null. */
export async function findHomeInScope(scope: Scope, homeId: string): Promise<{ id: string } | null> {
  if (!isUuid(homeId)) return null;
  const [row] = await db().select({ id: homes.id }).from(homes).where(and(eq(homes.id, homeId), homeInScope(scope))).limit(1);
  return row ?? null;
}

/** Stores one validated tariff (a company default when homeId is null). */
export async function insertTariff(input: { companyId: string; homeId: string | null; tariff: Tariff; createdBy: string | null }): Promise<TariffRow> {
  const t = input.tariff;
  const [row] = await db().insert(tariffs).values({
    companyId: input.companyId, homeId: input.homeId, kind: t.kind, name: t.name ?? null,
    validFrom: new Date(t.validFromMs), validTo: t.validToMs === null ? null : new Date(t.validToMs),
    prices: t, createdBy: input.createdBy,
  }).returning();
  return row!;
}

/**
 * Tariffs the viewer may see: the company defaults and, for `homeId`, that home's own (the caller
 * checks the home is in scope first). Newest start first.
 */
export async function listTariffs(companyId: string, homeId: string | null): Promise<TariffRow[]> {
  const which = homeId === null ? isNull(tariffs.homeId) : or(isNull(tariffs.homeId), eq(tariffs.homeId, homeId));
  return db().select().from(tariffs).where(and(eq(tariffs.companyId, companyId), which)).orderBy(desc(tariffs.validFrom), desc(tariffs.createdAt));
}

/** The tariffs that price a home: its own when it has any, otherwise the company defaults. */
export async function tariffsForHome(companyId: string, homeId: string | null): Promise<{ source: 'home' | 'company' | 'none'; tariffs: Tariff[] }> {
  const rows = await listTariffs(companyId, homeId);
  const own = rows.filter((r) => r.homeId !== null);
  const chosen = own.length > 0 ? own : rows.filter((r) => r.homeId === null);
  // Oldest first, so that priceAt's "latest start wins" sees the list in the order it was entered.
  const list = chosen.map((r) => r.prices).reverse();
  return { source: own.length > 0 ? 'home' : list.length > 0 ? 'company' : 'none', tariffs: list };
}

/** What accounting and planning need to know about a tank the viewer may see, or null. */
export async function findEnergyTank(scope: Scope, tankId: string) {
  if (!isUuid(tankId)) return null;
  const [row] = await db().select({
    id: tanks.id, serial: tanks.serial, companyId: tanks.companyId, homeId: tanks.homeId,
    volumeL: tanks.volumeL, heightM: tanks.heightM, sensorCount: tanks.sensorCount, heatSource: tanks.heatSource,
    hpOutputW: tanks.hpOutputW, immersionW: tanks.immersionW, declaredLossW: tanks.declaredLossW,
    targetC: tanks.targetC, occupants: homes.occupants,
  }).from(tanks).leftJoin(homes, eq(homes.id, tanks.homeId)).where(and(eq(tanks.id, tankId), tankInScope(scope))).limit(1);
  return row ?? null;
}
export type EnergyTank = NonNullable<Awaited<ReturnType<typeof findEnergyTank>>>;

/** A tank's readings in [from, to), oldest first, only the columns the energy core uses. */
export async function listEnergyReadings(tankId: string, from: Date, to: Date) {
  return db().select({
    ts: readings.ts, layersCc: readings.layersCc, compressor: readings.compressor,
    immersionW: readings.immersionW, powerW: readings.powerW, drawDlpm: readings.drawDlpm,
  }).from(readings).where(and(eq(readings.tankId, tankId), gte(readings.ts, from), lt(readings.ts, to))).orderBy(asc(readings.ts));
}
export type EnergyReadingRow = Awaited<ReturnType<typeof listEnergyReadings>>[number];

/** Start of the tank's newest compressor run, or null (for the one-start-an-hour rule). */
export async function lastCompressorStart(tankId: string): Promise<Date | null> {
  const [row] = await db().select({ at: telemetryEvents.startedAt }).from(telemetryEvents)
    .where(and(eq(telemetryEvents.tankId, tankId), eq(telemetryEvents.kind, 'compressor_run')))
    .orderBy(desc(telemetryEvents.startedAt)).limit(1);
  return row?.at ?? null;
}
