// Layer temperatures as the database stores them (centi-degrees, nullable per sensor) turned into
// °C, and the figures the thermal core derives from one column of layers.
import { mixNumber, mixedWaterLitres, stateOfCharge, storedEnergyKWh, thermocline } from '../thermal';

/** Cold mains water assumed by V40 and state of charge (EN 16147 defines V40 against 10 °C). */
export const COLD_WATER_C = 10;
/** Mixed-water delivery temperature of V40 (EN 16147). */
export const V40_DELIVERY_C = 40;

export const ccToC = (cc: number | null | undefined): number | null => (cc === null || cc === undefined ? null : cc / 100);

export function layersFromCc(cc: readonly (number | null)[] | null | undefined): (number | null)[] {
  return cc ? cc.map(ccToC) : [];
}

/** True when every layer has a value (a null is a sensor the device reported open or shorted). */
export function complete(layersC: readonly (number | null)[]): layersC is number[] {
  return layersC.length > 0 && layersC.every((t) => t !== null && Number.isFinite(t));
}

/**
 * Layer thicknesses from sensor positions (heights above the tank bottom, bottom to top): each
 * sensor stands for the water from half-way to the sensor below to half-way to the one above.
 * Null positions mean evenly spaced sensors, so equal layers (undefined for the thermal core).
 */
export function layerThicknesses(positionsM: readonly number[] | null | undefined, tankHeightM: number): number[] | undefined {
  if (!positionsM || positionsM.length === 0) return undefined;
  const out: number[] = [];
  for (let i = 0; i < positionsM.length; i++) {
    const lower = i === 0 ? 0 : (positionsM[i - 1]! + positionsM[i]!) / 2;
    const upper = i === positionsM.length - 1 ? tankHeightM : (positionsM[i]! + positionsM[i + 1]!) / 2;
    out.push(Math.max(1e-6, upper - lower));
  }
  return out;
}

export interface TankShape { volumeL: number; heightM: number; targetC: number; sensorHeightsM?: readonly number[] | null }

export interface ColumnFigures {
  /** 0–1 against the tank's target temperature. */ soc: number;
  /** Litres of mixed water at 40 °C (EN 16147 V40). */ v40L: number;
  /** Heat above cold mains, kWh. */ storedKWh: number;
  /** Davidson, Adams & Miller MIX number, 0 stratified – 1 mixed. */ mix: number;
  /** Height of the thermocline above the bottom, metres, or null when there is no transition. */ thermoclineM: number | null;
}

/**
 * Figures of one column of layers from the thermal core, or null when a sensor is missing or
 * out of the range the property tables cover: a figure is never computed from a guess.
 */
export function columnFigures(layersC: readonly (number | null)[], tank: TankShape): ColumnFigures | null {
  if (!complete(layersC) || layersC.some((t) => t < 0 || t > 100)) return null;
  const heightsM = layerThicknesses(tank.sensorHeightsM, tank.heightM);
  const base = { layersC, heightsM };
  const tc = thermocline(heightsM ? base : { layersC, tankHeightM: tank.heightM });
  return {
    soc: stateOfCharge({ ...base, coldC: COLD_WATER_C, targetC: Math.max(tank.targetC, COLD_WATER_C + 1) }),
    v40L: mixedWaterLitres({ ...base, volumeL: tank.volumeL, coldC: COLD_WATER_C, deliveryC: V40_DELIVERY_C }),
    storedKWh: storedEnergyKWh({ ...base, volumeL: tank.volumeL, refC: COLD_WATER_C }),
    mix: mixNumber(base),
    thermoclineM: tc ? tc.heightM : null,
  };
}

/** Heights of the sensors above the bottom, metres (evenly spaced at layer centres when not recorded). */
export function sensorPositions(count: number, tankHeightM: number, positionsM?: readonly number[] | null): number[] {
  if (positionsM && positionsM.length === count) return [...positionsM];
  return Array.from({ length: count }, (_, i) => ((i + 0.5) / count) * tankHeightM);
}
