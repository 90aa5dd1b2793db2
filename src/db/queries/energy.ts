// Named queries of energy and planning: tariffs (company defaults and a home's own) and what the
// accounting and the planner read about a tank.
import { and, asc, desc, eq, gte, isNull, lt, or, sql } from 'drizzle-orm';
import { db } from '..';
import { homes, readings, tanks, tariffs, telemetryEvents, type TariffRow } from '../schema';
import type { Tariff, TariffLayers } from '../../lib/energy';
import { homeTariffs, type TariffSource } from '../../lib/tank-energy/tariff-layers';
import type { Scope } from '../../lib/server/authz';
import { homeInScope, isUuid, tankInScope } from './scope';

/** A home of the viewer's scope, or null. */
export async function findHomeInScope(scope: Scope, homeId: string): Promise<{ id: string } | null> {
  if (!isUuid(homeId)) return null;
  const [row] = await db()
    .select({ id: homes.id })
    .from(homes)
    .where(and(eq(homes.id, homeId), homeInScope(scope)))
    .limit(1);
  return row ?? null;
}

/** Stores one validated tariff (a company default when homeId is null). */
export async function insertTariff(input: {
  companyId: string;
  homeId: string | null;
  tariff: Tariff;
  createdBy: string | null;
}): Promise<TariffRow> {
  const t = input.tariff;
  const [row] = await db()
    .insert(tariffs)
    .values({
      companyId: input.companyId,
      homeId: input.homeId,
      kind: t.kind,
      name: t.name ?? null,
      validFrom: new Date(t.validFromMs),
      validTo: t.validToMs === null ? null : new Date(t.validToMs),
      prices: t,
      createdBy: input.createdBy,
    })
    .returning();
  return row!;
}

/**
 * Tariffs the viewer may see: the company defaults and, for `homeId`, that home's own (the caller
 * checks the home is in scope first). Newest start first.
 */
export async function listTariffs(companyId: string, homeId: string | null): Promise<TariffRow[]> {
  const which = homeId === null ? isNull(tariffs.homeId) : or(isNull(tariffs.homeId), eq(tariffs.homeId, homeId));
  return db()
    .select()
    .from(tariffs)
    .where(and(eq(tariffs.companyId, companyId), which))
    .orderBy(desc(tariffs.validFrom), desc(tariffs.createdAt));
}

/** The tariffs that price a home: its own where one is in force, the company defaults at other times. */
export async function tariffsForHome(
  companyId: string,
  homeId: string | null,
): Promise<{ source: TariffSource; tariffs: TariffLayers }> {
  return homeTariffs(await listTariffs(companyId, homeId), homeId);
}

/** What accounting and planning need to know about a tank the viewer may see, or null. */
export async function findEnergyTank(scope: Scope, tankId: string) {
  if (!isUuid(tankId)) return null;
  const [row] = await db()
    .select({
      id: tanks.id,
      serial: tanks.serial,
      companyId: tanks.companyId,
      homeId: tanks.homeId,
      volumeL: tanks.volumeL,
      heightM: tanks.heightM,
      sensorCount: tanks.sensorCount,
      heatSource: tanks.heatSource,
      hpOutputW: tanks.hpOutputW,
      immersionW: tanks.immersionW,
      declaredLossW: tanks.declaredLossW,
      targetC: tanks.targetC,
      occupants: homes.occupants,
      sensorHeightsM: tanks.sensorHeightsM,
      coldInletC: homes.coldInletC,
    })
    .from(tanks)
    .leftJoin(homes, eq(homes.id, tanks.homeId))
    .where(and(eq(tanks.id, tankId), tankInScope(scope)))
    .limit(1);
  return row ?? null;
}
export type EnergyTank = NonNullable<Awaited<ReturnType<typeof findEnergyTank>>>;

/** A tank's readings in [from, to), oldest first, only the columns the energy core uses. */
export async function listEnergyReadings(tankId: string, from: Date, to: Date) {
  return db()
    .select({
      ts: readings.ts,
      layersCc: readings.layersCc,
      compressor: readings.compressor,
      immersionW: readings.immersionW,
      powerW: readings.powerW,
      drawDlpm: readings.drawDlpm,
      solarSurplusW: readings.solarSurplusW,
    })
    .from(readings)
    .where(and(eq(readings.tankId, tankId), gte(readings.ts, from), lt(readings.ts, to)))
    .orderBy(asc(readings.ts));
}
export type EnergyReadingRow = Awaited<ReturnType<typeof listEnergyReadings>>[number];

/** Start of the tank's newest compressor run, or null (for the one-start-an-hour rule). */
export async function lastCompressorStart(tankId: string): Promise<Date | null> {
  const [row] = await db()
    .select({ at: telemetryEvents.startedAt })
    .from(telemetryEvents)
    .where(and(eq(telemetryEvents.tankId, tankId), eq(telemetryEvents.kind, 'compressor_run')))
    .orderBy(desc(telemetryEvents.startedAt))
    .limit(1);
  return row?.at ?? null;
}

/** The tanks of a home the viewer may see, oldest first (a home normally has one). */
export async function tankIdsOfHome(scope: Scope, homeId: string): Promise<string[]> {
  if (!isUuid(homeId)) return [];
  const rows = await db()
    .select({ id: tanks.id })
    .from(tanks)
    .where(and(eq(tanks.homeId, homeId), tankInScope(scope)))
    .orderBy(asc(tanks.createdAt));
  return rows.map((r) => r.id);
}

/** Homes of the company with tariffs of their own, for the tariffs page (at most `limit`). */
export async function homesWithOwnTariffs(
  companyId: string,
  limit = 200,
): Promise<{ id: string; reference: string; addressLine: string; town: string; tariffs: number }[]> {
  const rows = await db()
    .select({
      id: homes.id,
      reference: homes.reference,
      addressLine: homes.addressLine,
      town: homes.town,
      tariffs: sql<number>`count(*)::int`,
    })
    .from(tariffs)
    .innerJoin(homes, eq(homes.id, tariffs.homeId))
    .where(eq(tariffs.companyId, companyId))
    .groupBy(homes.id)
    .orderBy(asc(homes.reference))
    .limit(limit);
  return rows;
}
