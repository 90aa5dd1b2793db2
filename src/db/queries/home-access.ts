import { and, eq } from 'drizzle-orm';
import { db, type Tx } from '..';
import { homes, tankLatestState, tanks, type TankLatestState } from '../schema';
import type { FiguresQuality } from '../../lib/thermal';
import type { Scope } from '../../lib/server/authz';
import { homeInScope, isUuid } from './scope';

export interface HomeSummary {
  id: string;
  companyId: string;
  reference: string;
  addressLine: string;
  town: string;
  postcode: string;
}

/** The columns of a HomeSummary. */
const homeSummaryColumns = {
  id: homes.id,
  companyId: homes.companyId,
  reference: homes.reference,
  addressLine: homes.addressLine,
  town: homes.town,
  postcode: homes.postcode,
};

/** A home the viewer may see, or null (another company's, another householder's, or no such home). */
export async function getHomeInScope(scope: Scope, homeId: string): Promise<HomeSummary | null> {
  if (!isUuid(homeId)) return null;
  const [row] = await db()
    .select(homeSummaryColumns)
    .from(homes)
    .where(and(eq(homes.id, homeId), homeInScope(scope)));
  return row ?? null;
}

export const homeLabel = (h: Pick<HomeSummary, 'reference' | 'addressLine' | 'town'>): string =>
  `${h.addressLine}, ${h.town} (${h.reference})`;

/** A home's own settings: its cold-inlet temperature, °C (null: none set). */
export async function homeSettings(
  scope: Scope,
  homeId: string,
): Promise<(HomeSummary & { coldInletC: number | null }) | null> {
  if (!isUuid(homeId)) return null;
  const [row] = await db()
    .select({ ...homeSummaryColumns, coldInletC: homes.coldInletC })
    .from(homes)
    .where(and(eq(homes.id, homeId), homeInScope(scope)));
  return row ?? null;
}

/** Sets a home's cold inlet (locking the row); the value it had, or undefined when the home is not in scope. */
export async function updateColdInlet(
  tx: Tx,
  scope: Scope,
  homeId: string,
  coldInletC: number | null,
): Promise<{ previous: number | null } | undefined> {
  if (!isUuid(homeId)) return undefined;
  const [before] = await tx
    .select({ c: homes.coldInletC })
    .from(homes)
    .where(and(eq(homes.id, homeId), homeInScope(scope)))
    .for('update');
  if (!before) return undefined;
  await tx.update(homes).set({ coldInletC }).where(eq(homes.id, homeId));
  return { previous: before.c };
}

/** The latest stored column of each of a home's tanks with what its figures need, rows locked. */
export async function latestColumnsOfHome(
  tx: Tx,
  homeId: string,
): Promise<
  {
    tankId: string;
    volumeL: number;
    heightM: number;
    sensorCount: number;
    sensorHeightsM: number[] | null;
    targetC: number;
    layersCc: (number | null)[] | null;
    sensorCheck: TankLatestState['sensorCheck'];
  }[]
> {
  return tx
    .select({
      tankId: tanks.id,
      volumeL: tanks.volumeL,
      heightM: tanks.heightM,
      sensorCount: tanks.sensorCount,
      sensorHeightsM: tanks.sensorHeightsM,
      targetC: tanks.targetC,
      layersCc: tankLatestState.layersCc,
      sensorCheck: tankLatestState.sensorCheck,
    })
    .from(tanks)
    .innerJoin(tankLatestState, eq(tankLatestState.tankId, tanks.id))
    .where(eq(tanks.homeId, homeId))
    .for('update', { of: tankLatestState });
}

/** Stores recomputed latest figures of a tank. */
export async function storeLatestFigures(
  tx: Tx,
  tankId: string,
  f: { soc: number | null; v40L: number | null; quality: FiguresQuality },
): Promise<void> {
  await tx
    .update(tankLatestState)
    .set({ soc: f.soc, v40L: f.v40L, figuresQuality: f.quality })
    .where(eq(tankLatestState.tankId, tankId));
}
