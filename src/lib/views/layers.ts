// Layer temperatures as the database stores them (centi-degrees, nullable per sensor) turned into
// °C, and the figures the thermal core derives from one column of layers.
import {
  EN16147_COLD_C,
  EN16147_DELIVERY_C,
  layerThicknesses as coreThicknesses,
  sensorPositions,
  tankFigures,
  type FiguresQuality,
  type TankFigures,
  type TankGeometry,
} from '../thermal';

/** Cold mains water assumed by V40 and state of charge (EN 16147 defines V40 against 10 °C). */
export const COLD_WATER_C = EN16147_COLD_C;
/** Mixed-water delivery temperature of V40 (EN 16147). */
export const V40_DELIVERY_C = EN16147_DELIVERY_C;

export const ccToC = (cc: number | null | undefined): number | null =>
  cc === null || cc === undefined ? null : cc / 100;

export function layersFromCc(cc: readonly (number | null)[] | null | undefined): (number | null)[] {
  return cc ? cc.map(ccToC) : [];
}

/** True when every layer has a value (a null is a sensor the device reported open or shorted). */
export function complete(layersC: readonly (number | null)[]): layersC is number[] {
  return layersC.length > 0 && layersC.every((t) => t !== null && Number.isFinite(t));
}

/** What the figures need of a tank row (the thermal core's geometry). */
export interface TankShape {
  volumeL: number;
  heightM: number;
  targetC: number;
  sensorCount?: number;
  sensorHeightsM?: readonly number[] | null;
  coldInletC?: number | null;
}

/** The thermal core's figures of one column, with their quality (measured, estimated, withheld). */
export type ColumnFigures = TankFigures;

export const geometryOf = (tank: TankShape, count?: number): TankGeometry => ({
  volumeL: tank.volumeL,
  heightM: tank.heightM,
  targetC: tank.targetC,
  sensorCount: tank.sensorCount ?? count ?? 1,
  sensorHeightsM: tank.sensorHeightsM ?? null,
  coldInletC: tank.coldInletC ?? null,
});

/**
 * Figures of one column of layers: the thermal core's `tankFigures`, the one definition every
 * screen and the writer share (`stuck`: sensors, 0-based, the writer's stuck check holds stuck).
 * Null only when there is no reading at all.
 */
export function columnFigures(
  layersC: readonly (number | null)[],
  tank: TankShape,
  stuck: readonly number[] = [],
): ColumnFigures | null {
  if (layersC.length === 0) return null;
  return tankFigures({ layersC }, geometryOf(tank, layersC.length), { stuck });
}

/** Stored figures' quality; rows written before it was kept count as measured (never heard: withheld). */
export function storedQuality(q: FiguresQuality | null | undefined, heard: boolean): FiguresQuality {
  if (q) return q;
  return heard
    ? { status: 'measured', leftOut: [], faults: [], reason: null }
    : { status: 'withheld', leftOut: [], faults: [], reason: 'No reading has arrived yet.' };
}

/** Layer thicknesses (metres) of a tank's sensors, for analyses weighting layers by volume. */
export function layerThicknesses(
  positionsM: readonly number[] | null | undefined,
  tankHeightM: number,
): number[] | undefined {
  if (!positionsM || positionsM.length === 0) return undefined;
  return coreThicknesses(positionsM, tankHeightM);
}

export { sensorPositions };
export type { FiguresQuality };
