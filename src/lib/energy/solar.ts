// Diverting solar surplus to the immersion: heat the tank with power that would otherwise be
// exported, as long as the water the element can reach has room below its thermostat.
// A diverter measures at the meter, after its own diversion, so the surplus is what is exported
// now plus what is already being diverted.
import { waterCp, waterDensity } from '../thermal/index.js';
import { EnergyInputError } from './errors.js';
import { J_PER_KWH } from './units.js';
import { finite, nonNegative, positive } from './validate.js';

/** What the diversion rule sees at one moment. */
export interface DiversionInput {
  /** Power flowing out to the grid now, W (0 when importing). */ exportW: number;
  /** Power the immersion is taking from the diverter now, W. */ divertingW: number;
  /** Immersion element rating, W. */ immersionW: number;
  /** Layer temperatures, °C, bottom to top. */ layersC: readonly number[];
  /** Stored volume, litres. */ volumeL: number;
  /** Height of the element, 0 bottom … 1 top. */ immersionHeightFrac: number;
  /** The element's thermostat, °C (default 65). */ statC?: number;
  /** Export left undiverted so that a passing cloud does not draw from the grid, W (default 50; common practice). */ marginW?: number;
}

/** The rule's answer. */
export interface Diversion {
  /** Power to send to the immersion now, W (0 … immersionW). */ divertW: number;
  /** Heat the water at and above the element can still take before its thermostat, kWh. */ roomKWh: number;
  /** Why: diverting, no surplus to divert, or the reachable water is at the thermostat. */ reason:
    | 'diverting'
    | 'no_surplus'
    | 'tank_full';
}

/** Below this much room the tank counts as full, kWh (about a minute of a 3 kW element). */
const FULL_KWH = 0.05;

/** How much solar surplus to divert to the immersion now, W; heat so made is free (account it through EnergyReading.solarSurplusW). */
export function solarDiversion(input: DiversionInput): Diversion {
  const exportW = nonNegative('exportW', input.exportW, 'W');
  const divertingW = nonNegative('divertingW', input.divertingW, 'W');
  const immersionW = nonNegative('immersionW', input.immersionW, 'W');
  const volumeL = positive('volumeL', input.volumeL, 'litres');
  const frac = finite('immersionHeightFrac', input.immersionHeightFrac, 'a fraction 0–1');
  if (frac < 0 || frac > 1)
    throw new EnergyInputError(
      'immersionHeightFrac',
      `immersionHeightFrac is ${frac}: it must be from 0 (bottom) to 1 (top).`,
    );
  const statC = finite('statC', input.statC ?? 65, '°C');
  const marginW = nonNegative('marginW', input.marginW ?? 50, 'W');
  const layers = input.layersC;
  if (!Array.isArray(layers) || layers.length === 0)
    throw new EnergyInputError('layersC', 'layersC must hold one or more layer temperatures, bottom to top.');
  const n = layers.length;
  const first = Math.min(n - 1, Math.floor(frac * n));
  let roomJ = 0;
  for (let i = first; i < n; i++) {
    const t = finite(`layersC[${i}]`, layers[i], '°C');
    if (t < statC) roomJ += (volumeL / n / 1000) * waterDensity(t) * waterCp((t + statC) / 2) * (statC - t);
  }
  const roomKWh = roomJ / J_PER_KWH;
  if (roomKWh < FULL_KWH) return { divertW: 0, roomKWh, reason: 'tank_full' };
  const divertW = Math.min(immersionW, Math.max(0, exportW + divertingW - marginW));
  return divertW > 0 ? { divertW, roomKWh, reason: 'diverting' } : { divertW: 0, roomKWh, reason: 'no_surplus' };
}
