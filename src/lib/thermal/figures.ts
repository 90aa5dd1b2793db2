// The one place a reading of layer temperatures becomes a tank's figures: state of charge, V40,
// stored heat, heat to full, MIX number and thermocline. The writer (latest state), every view
// and API, and the alert rules call `tankFigures`, so one tank shows one set of figures everywhere.
//
// A sensor the checks doubt (missing, out of range, stuck, out of order; sensor-check.ts) is left
// out and its layer estimated by linear interpolation on sensor height between the nearest
// believed sensors below and above (the bottom one, with nothing below, takes the value above).
// The figures are then marked estimated. With the top sensor or two adjacent sensors left out the
// column cannot be estimated honestly (the top decides the hot water; two missing neighbours hide
// a whole stretch of the thermocline), so the figures are withheld and say why.
import { mixedWaterLitres, stateOfCharge, storedEnergyKWh } from './energy.js';
import { ThermalInputError } from './errors.js';
import { mixNumber, thermocline } from './stratification.js';
import {
  DEFAULT_SENSOR_LIMITS,
  DEFAULT_STUCK_LIMITS,
  initialStuck,
  sensorFaults,
  stepStuck,
  stuckSensors,
  type SensorFault,
  type SensorLimits,
  type StuckLimits,
  type StuckState,
} from './sensor-check.js';
import { finite, positive } from './validate.js';

/** Cold water of the EN 16147 V40 and its tapping cycles, °C. */
export const EN16147_COLD_C = 10;
/** Mixed-water delivery temperature of V40 (EN 16147), °C. */
export const EN16147_DELIVERY_C = 40;

/** What the figures need to know about a cylinder. */
export interface TankGeometry {
  volumeL: number;
  /** Height of the water column, metres. */ heightM: number;
  sensorCount: number;
  /** Sensor heights above the bottom, metres, bottom to top; null or absent: evenly spaced. */ sensorHeightsM?:
    | readonly number[]
    | null;
  /** Thermostat target, °C: full charge. */ targetC: number;
  /** The home's cold-inlet temperature, °C, where the company has set one; otherwise EN 16147's 10 °C. */ coldInletC?:
    | number
    | null;
}

export interface FigureOptions {
  /** Sensor check limits (default: the sensor-fault rule's defaults). */ limits?: SensorLimits;
  /** Sensors (0-based) a stuck check over time holds stuck (`stuckSensors`). */ stuck?: readonly number[];
}

export type FiguresStatus = 'measured' | 'estimated' | 'withheld';

export interface FiguresQuality {
  status: FiguresStatus;
  /** Sensors left out, numbered from 1 at the bottom. */ leftOut: number[];
  /** Why each was left out. */ faults: { sensor: number; fault: SensorFault }[];
  /** One sentence for staff ("Estimated, sensor 3 left out (no reading)."); null when measured. */ reason:
    | string
    | null;
}

export interface TankFigures {
  /** 0–1 against the target. */ soc: number | null;
  /** Litres of mixed water at 40 °C. */ v40L: number | null;
  /** Heat above the cold inlet, kWh. */ storedKWh: number | null;
  /** Heat still to add for every layer to reach the target, kWh. */ toFullKWh: number | null;
  /** MIX number, 0 stratified – 1 mixed. */ mix: number | null;
  /** Thermocline height above the bottom, metres; null without a transition (or when withheld). */ thermoclineM:
    | number
    | null;
  /** Cold water the figures count from, °C. */ coldC: number;
  /** The column used, measured and estimated layers, °C; null when withheld. */ layersC: number[] | null;
  quality: FiguresQuality;
}

/** Sensor heights, metres: the recorded ones, or evenly spaced at layer centres. */
export function sensorPositions(count: number, heightM: number, positionsM?: readonly number[] | null): number[] {
  if (positionsM && positionsM.length === count) return [...positionsM];
  return Array.from({ length: count }, (_, i) => ((i + 0.5) / count) * heightM);
}

/** Each sensor stands for the water from half-way to the sensor below to half-way to the one above, metres. */
export function layerThicknesses(positionsM: readonly number[], heightM: number): number[] {
  return positionsM.map((z, i) => {
    const lower = i === 0 ? 0 : (positionsM[i - 1]! + z) / 2;
    const upper = i === positionsM.length - 1 ? heightM : (z + positionsM[i + 1]!) / 2;
    return Math.max(1e-6, upper - lower);
  });
}

/**
 * Mean water temperature of a full column, °C, each layer weighted by the water it stands for
 * (`layerThicknesses`): what a cooling curve follows, on the tank page and in the heat-loss rule alike.
 */
export function columnMeanC(
  layersC: readonly number[],
  geometry: Pick<TankGeometry, 'heightM' | 'sensorHeightsM'>,
): number {
  const weights = layerThicknesses(
    sensorPositions(layersC.length, geometry.heightM, geometry.sensorHeightsM),
    geometry.heightM,
  );
  const total = weights.reduce((a, b) => a + b, 0);
  return layersC.reduce((a, t, i) => a + t * weights[i]!, 0) / total;
}

/** The cold water a tank's figures count from, °C: the home's cold inlet, else EN 16147's. */
export function coldWaterC(geometry: Pick<TankGeometry, 'coldInletC'>): number {
  return geometry.coldInletC ?? EN16147_COLD_C;
}

const faultWords: Record<SensorFault, string> = {
  missing: 'no reading',
  out_of_range: 'reading out of range',
  stuck: 'stuck',
  out_of_order: 'out of order',
};

const listOf = (xs: readonly string[]) =>
  xs.length <= 1 ? xs.join('') : `${xs.slice(0, -1).join(', ')} and ${xs.at(-1)}`;

function leftOutWords(faults: readonly { sensor: number; fault: SensorFault }[]): string {
  const kinds = [...new Set(faults.map((f) => faultWords[f.fault]))];
  const numbers = faults.map((f) => String(f.sensor));
  return `${faults.length === 1 ? 'sensor' : 'sensors'} ${listOf(numbers)} left out (${kinds.join(', ')})`;
}

/**
 * The figures of one reading. `reading.layersC` is bottom to top, °C, null for a sensor that gave
 * nothing. Throws ThermalInputError for an impossible geometry; a bad reading is never an error,
 * it only lowers the quality.
 */
export function tankFigures(
  reading: { layersC: readonly (number | null | undefined)[] },
  geometry: TankGeometry,
  options: FigureOptions = {},
): TankFigures {
  const volumeL = positive('geometry.volumeL', geometry.volumeL, 'litres');
  const heightM = positive('geometry.heightM', geometry.heightM, 'metres');
  const n = geometry.sensorCount;
  if (!Number.isInteger(n) || n < 1)
    throw new ThermalInputError(
      'geometry.sensorCount',
      `geometry.sensorCount is ${n}: it must be a whole number of sensors from 1.`,
    );
  const coldC = finite('geometry.coldInletC', coldWaterC(geometry), 'a temperature in °C');
  if (coldC < 0 || coldC >= 30)
    throw new ThermalInputError(
      'geometry.coldInletC',
      `geometry.coldInletC is ${coldC} °C: a cold inlet is between 0 and 30 °C.`,
    );
  const targetC = Math.min(
    100,
    Math.max(finite('geometry.targetC', geometry.targetC, 'a temperature in °C'), coldC + 1),
  );

  const faults = sensorFaults(reading.layersC, n, options.limits ?? DEFAULT_SENSOR_LIMITS, options.stuck);
  const leftOut = faults.flatMap((f, i) => (f ? [{ sensor: i + 1, fault: f }] : []));
  const withheld = (reason: string): TankFigures => ({
    soc: null,
    v40L: null,
    storedKWh: null,
    toFullKWh: null,
    mix: null,
    thermoclineM: null,
    coldC,
    layersC: null,
    quality: { status: 'withheld', leftOut: leftOut.map((f) => f.sensor), faults: leftOut, reason },
  });
  if (faults[n - 1])
    return withheld(
      `Withheld: the top sensor (${n}) is left out (${faultWords[faults[n - 1]!]}), and the hottest water cannot be estimated without it.`,
    );
  for (let i = 0; i + 1 < n; i++) {
    if (faults[i] && faults[i + 1])
      return withheld(
        `Withheld: sensors ${i + 1} and ${i + 2} are left out side by side (${[...new Set([faultWords[faults[i]!], faultWords[faults[i + 1]!]])].join(', ')}), too much of the column to estimate.`,
      );
  }

  const z = sensorPositions(n, heightM, geometry.sensorHeightsM);
  const clamp = (t: number) => Math.min(100, Math.max(0, t));
  const column: number[] = new Array(n);
  for (let i = 0; i < n; i++) if (!faults[i]) column[i] = clamp(reading.layersC[i]!);
  for (let i = 0; i < n; i++) {
    if (!faults[i]) continue;
    let below = i - 1;
    while (below >= 0 && faults[below]) below--;
    let above = i + 1;
    while (faults[above]) above++; // the top is believed, so this stops
    column[i] =
      below < 0
        ? column[above]!
        : column[below]! + ((column[above]! - column[below]!) * (z[i]! - z[below]!)) / (z[above]! - z[below]!);
  }

  const heightsM = layerThicknesses(z, heightM);
  const profile = { layersC: column, heightsM };
  const storedKWh = storedEnergyKWh({ ...profile, volumeL, refC: coldC });
  const fullKWh = storedEnergyKWh({ layersC: column.map(() => targetC), heightsM, volumeL, refC: coldC });
  const tc = thermocline(profile);
  return {
    soc: stateOfCharge({ ...profile, coldC, targetC }),
    v40L: mixedWaterLitres({ ...profile, volumeL, coldC, deliveryC: EN16147_DELIVERY_C }),
    storedKWh,
    toFullKWh: Math.max(0, fullKWh - storedKWh),
    mix: mixNumber(profile),
    thermoclineM: tc ? tc.heightM : null,
    coldC,
    layersC: column,
    quality:
      leftOut.length === 0
        ? { status: 'measured', leftOut: [], faults: [], reason: null }
        : {
            status: 'estimated',
            leftOut: leftOut.map((f) => f.sensor),
            faults: leftOut,
            reason: `Estimated, ${leftOutWords(leftOut)}.`,
          },
  };
}

/**
 * The figures of a run of readings, oldest first, with the stuck check stepped over them in time
 * order (as the writer steps it for the latest state): the charts, analyses, energy accounting
 * and the planner's history leave out the same sensors the latest figures do. Null for a reading
 * without layers.
 */
export function figuresOverTime(
  readings: readonly { t: number; layersC: readonly (number | null | undefined)[] }[],
  geometry: TankGeometry,
  options: { limits?: SensorLimits; stuckLimits?: StuckLimits; check?: StuckState } = {},
): (TankFigures | null)[] {
  // A check carried over from earlier readings continues (stepped in place); otherwise a new one.
  const check = options.check ?? initialStuck(geometry.sensorCount);
  return readings.map((r) => {
    if (r.layersC.length === 0) return null;
    stepStuck(check, r.t, r.layersC, options.stuckLimits ?? DEFAULT_STUCK_LIMITS);
    return tankFigures(r, geometry, {
      ...(options.limits ? { limits: options.limits } : {}),
      stuck: stuckSensors(check),
    });
  });
}
