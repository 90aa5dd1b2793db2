// What the energy core is given about a stored tank: its readings in core units and a model spec.
// Pure: no I/O.
import type { AccountingTank, EnergyReading } from '../energy';
import type { TankSpec } from '../thermal';
import { capabilities, hasMainSource } from '../heat-sources';

/** What the planner and the accounting need of a tank row. */
export interface EnergyTankFacts {
  volumeL: number; heightM: number; sensorCount: number;
  heatSource: TankSpec['heatSource']; hpOutputW: number; immersionW: number;
  declaredLossW: number | null; targetC: number;
}

/** One stored reading: centi-degrees, decilitres per minute (as src/db/schema/telemetry.ts keeps them). */
export interface StoredReading {
  ts: Date; layersCc: (number | null)[]; compressor: boolean | null;
  immersionW: number | null; powerW: number | null; drawDlpm: number | null;
  /** Solar power beyond the household's use, before diversion, W (null: the tank does not report it). */
  solarSurplusW: number | null;
}

/** Air around an indoor cylinder, °C: EN 12897 measures standing loss in a room at about 20 °C (from memory). */
export const AMBIENT_C = 20;
/** Standing loss assumed when none was declared, W (the alert rules' default; common practice for a 200 L cylinder). */
export const DEFAULT_LOSS_W = 60;
/** A declared standing loss is measured with the store 45 K above the room (EN 12897, from memory): UA = S / 45 K. */
export const DECLARED_LOSS_DELTA_K = 45;

/**
 * Readings in core units, oldest first. A reading with a sensor the device found open or shorted is
 * left out (the interval around it becomes a gap rather than a guess).
 */
export function energyReadings(rows: readonly StoredReading[]): EnergyReading[] {
  const out: EnergyReading[] = [];
  for (const r of rows) {
    if (r.layersCc.length === 0 || r.layersCc.some((c) => c === null)) continue;
    const e: EnergyReading = { ts: r.ts.getTime(), layersC: r.layersCc.map((c) => c! / 100) };
    if (r.compressor !== null) e.compressor = r.compressor;
    if (r.immersionW !== null) e.immersionW = r.immersionW;
    if (r.powerW !== null) e.powerW = r.powerW;
    if (r.drawDlpm !== null) e.drawLpm = r.drawDlpm / 10;
    if (r.solarSurplusW !== null) e.solarSurplusW = r.solarSurplusW;
    out.push(e);
  }
  return out;
}

export function uaWPerK(t: Pick<EnergyTankFacts, 'declaredLossW'>): number {
  return (t.declaredLossW ?? DEFAULT_LOSS_W) / DECLARED_LOSS_DELTA_K;
}

export function accountingTank(t: EnergyTankFacts): AccountingTank {
  return { volumeL: t.volumeL, uaWPerK: uaWPerK(t), ambientC: AMBIENT_C };
}

/** The thermal-core model of a stored tank (immersion heights as the fleet simulator fits them). */
export function tankSpec(t: EnergyTankFacts): TankSpec {
  const immersionOnly = capabilities(t.heatSource).immersion === 'only';
  return {
    volumeL: t.volumeL, sensorCount: t.sensorCount, heightM: t.heightM, ambientC: AMBIENT_C, uaWPerK: uaWPerK(t),
    heatSource: t.heatSource, hpOutputW: hasMainSource(t.heatSource) ? t.hpOutputW : 0, immersionW: t.immersionW,
    immersionHeightFrac: immersionOnly ? 0.15 : 0.55,
  };
}
