// What the energy core is given about a stored tank: its readings in core units and a model spec.
// Pure: no I/O.
import type { AccountingTank, EnergyReading } from '../energy';
import {
  coldWaterC,
  figuresOverTime,
  layerThicknesses,
  sensorPositions,
  type TankGeometry,
  type TankSpec,
} from '../thermal';
import { capabilities, hasMainSource } from '../heat-sources';

/** What the planner and the accounting need of a tank row. */
export interface EnergyTankFacts {
  volumeL: number;
  heightM: number;
  sensorCount: number;
  heatSource: TankSpec['heatSource'];
  hpOutputW: number;
  immersionW: number;
  declaredLossW: number | null;
  targetC: number;
  /** Sensor heights, metres (null: evenly spaced); the home's cold inlet, °C (null: EN 16147's 10 °C). */
  sensorHeightsM?: readonly number[] | null;
  coldInletC?: number | null;
}

/** The thermal core's geometry of a tank row, for its figures. */
export const figureGeometry = (t: EnergyTankFacts): TankGeometry => ({
  volumeL: t.volumeL,
  heightM: t.heightM,
  sensorCount: t.sensorCount,
  sensorHeightsM: t.sensorHeightsM ?? null,
  targetC: t.targetC,
  coldInletC: t.coldInletC ?? null,
});

/** The cold water a tank's energy counts from, °C. */
export const tankColdC = (t: EnergyTankFacts): number => coldWaterC(t);

/** One stored reading: centi-degrees, decilitres per minute (as src/db/schema/telemetry.ts keeps them). */
export interface StoredReading {
  ts: Date;
  layersCc: (number | null)[];
  compressor: boolean | null;
  immersionW: number | null;
  powerW: number | null;
  drawDlpm: number | null;
  /** Solar power beyond the household's use, before diversion, W (null: the tank does not report it). */
  solarSurplusW: number | null;
}

/** Air around an indoor cylinder, °C: EN 12897 measures standing loss in a room at about 20 °C (from memory). */
const AMBIENT_C = 20;
/** Standing loss assumed when none was declared, W (the alert rules' default; common practice for a 200 L cylinder). */
const DEFAULT_LOSS_W = 60;
/** A declared standing loss is measured with the store 45 K above the room (EN 12897, from memory): UA = S / 45 K. */
const DECLARED_LOSS_DELTA_K = 45;

/**
 * Readings in core units, oldest first, each column as the thermal core's figures give it: a
 * sensor left out (missing, open, stuck, out of order) is estimated by height; a reading whose
 * figures are withheld (top sensor, or two neighbours, out) is left out, so the interval around
 * it becomes a gap rather than a guess.
 */
export function energyReadings(rows: readonly StoredReading[], tank: EnergyTankFacts): EnergyReading[] {
  const figures = figuresOverTime(
    rows.map((r) => ({ t: r.ts.getTime(), layersC: r.layersCc.map((c) => (c === null ? null : c / 100)) })),
    figureGeometry(tank),
  );
  const out: EnergyReading[] = [];
  rows.forEach((r, i) => {
    const column = figures[i]?.layersC;
    if (!column) return;
    const e: EnergyReading = { ts: r.ts.getTime(), layersC: column };
    if (r.compressor !== null) e.compressor = r.compressor;
    if (r.immersionW !== null) e.immersionW = r.immersionW;
    if (r.powerW !== null) e.powerW = r.powerW;
    if (r.drawDlpm !== null) e.drawLpm = r.drawDlpm / 10;
    if (r.solarSurplusW !== null) e.solarSurplusW = r.solarSurplusW;
    out.push(e);
  });
  return out;
}

function uaWPerK(t: Pick<EnergyTankFacts, 'declaredLossW'>): number {
  return (t.declaredLossW ?? DEFAULT_LOSS_W) / DECLARED_LOSS_DELTA_K;
}

export function accountingTank(t: EnergyTankFacts): AccountingTank {
  return {
    volumeL: t.volumeL,
    uaWPerK: uaWPerK(t),
    ambientC: AMBIENT_C,
    heightsM: layerThicknesses(sensorPositions(t.sensorCount, t.heightM, t.sensorHeightsM), t.heightM),
  };
}

/** The thermal-core model of a stored tank (immersion heights as the fleet simulator fits them). */
export function tankSpec(t: EnergyTankFacts): TankSpec {
  const immersionOnly = capabilities(t.heatSource).immersion === 'only';
  return {
    volumeL: t.volumeL,
    sensorCount: t.sensorCount,
    heightM: t.heightM,
    ambientC: AMBIENT_C,
    uaWPerK: uaWPerK(t),
    heatSource: t.heatSource,
    hpOutputW: hasMainSource(t.heatSource) ? t.hpOutputW : 0,
    immersionW: t.immersionW,
    immersionHeightFrac: immersionOnly ? 0.15 : 0.55,
  };
}
