// A one-dimensional multi-node model of a stratified hot-water cylinder, stepped in time.
// Shared by the fleet simulator and the charge planner, so it is built for speed: plain
// number arrays updated in place, constants derived once per spec, no allocation per step
// beyond the returned state and result.
//
// Each step applies, in order: the draw (hot out at the top, cold in at the bottom, plug
// flow by upwind advection), the heat pump or boiler (plate heat exchanger or coil), the
// immersion element, standing loss to ambient (exact exponential decay per node), axial
// conduction between neighbouring nodes, and finally buoyant mixing of any inversion.
// Every operation moves energy only between nodes or across the accounted boundaries,
// so over a step  ΔE = heatInJ − drawnJ − lossJ  holds to rounding.
import { ThermalInputError } from './errors.js';
import { finite, nonNegative, positive, record, waterTemp } from './validate.js';
import { waterCp, waterDensity } from './water.js';
import { capabilities, heatSourceKinds, type HeatSource, type HeatSourceCapabilities } from '../heat-sources.js';

/** How heat reaches the stored water (the kinds and what each can do: src/lib/heat-sources.ts). */
export type { HeatSource };

/** Fixed description of one cylinder and its heat sources. Treat as immutable once used. */
export interface TankSpec {
  /** Stored volume, litres. */ volumeL: number;
  /** Temperature sensors on the column, evenly spaced bottom to top. */ sensorCount: number;
  /** Height of the water column, metres. */ heightM: number;
  /** Temperature around the cylinder, °C. */ ambientC: number;
  /** Standing-loss coefficient UA, W/K. */ uaWPerK: number;
  /** How the main heat source reaches the water. */ heatSource: HeatSource;
  /** Heat-pump (or boiler) thermal output to the tank, W; 0 if none. */ hpOutputW: number;
  /** Immersion element rating, W. */ immersionW: number;
  /** Height of the immersion element, 0 bottom … 1 top. */ immersionHeightFrac: number;
  /** Internal nodes (default max(sensorCount, 12)). */ nodes?: number;
  /** Default flow-temperature cap of the main source when a step gives none, °C (default 55 for a heat pump, 70 for a boiler). */ maxFlowC?: number;
  /** Immersion element thermostat: it adds no heat to water at or above this, °C (default 65). */ immersionStatC?: number;
  /** Fraction of the height occupied by a coil, from the bottom (default 0.3). */ coilHeightFrac?: number;
}

/** Node temperatures, °C, bottom to top (length = node count of the spec). */
export interface TankState {
  nodesC: number[];
}

/** What happens during one step. */
export interface StepInputs {
  /** Step length, seconds. */ dtS: number;
  /** Cold-water inlet temperature, °C. */ coldC: number;
  /** Hot-water draw from the top (cold enters at the bottom), litres per minute. */ drawLpm: number;
  /** Main heat source (heat pump or boiler) running; ignored for 'immersion_only'. */ hpOn: boolean;
  /** Immersion element energised. */ immersionOn: boolean;
  /** Highest flow temperature the main source can reach this step, °C; caps what it can add. */ hpFlowC?: number;
  /** Thermal output of the main source this step, W (default spec.hpOutputW). */ hpOutputW?: number;
  /** Power the immersion element takes this step, W, at most spec.immersionW (default the rating): a diverter's share of solar surplus. */ immersionPowerW?: number;
}

/** Outcome of one step; energies in joules over the step. */
export interface StepResult {
  /** Node temperatures after the step (a new array). */ state: TankState;
  /** hpHeatJ + immersionHeatJ. */ heatInJ: number;
  /** Heat added by the heat pump or boiler, J. */ hpHeatJ: number;
  /** Heat added by the immersion element, J. */ immersionHeatJ: number;
  /** Energy carried out by the draw relative to the cold water that replaced it, J. */ drawnJ: number;
  /** Heat lost to ambient, J (negative if the room is warmer than the water). */ lossJ: number;
  /** Temperature at the outlet: mass-weighted mean of the water drawn, or the top node after the step when nothing is drawn, °C. */ outletC: number;
}

/** Water properties of the model: fixed at 45 °C (IAPWS-IF97 region 1) so the model's energy balance is exact. */
export const MODEL_PROPERTY_C = 45;
/** Axial conductivity between nodes, W/(m·K): water at about 45 °C, 0.64 (from memory, heat-transfer handbook tables). */
const AXIAL_CONDUCTIVITY_W_PER_MK = 0.64;
/** Smallest temperature rise a plate-HX loop pass is modelled with, K; sets the loop's highest flow (common practice). */
const PLATE_MIN_RISE_K = 5;
/** A coil passes its full rating at this mean flow-to-water difference, K (common practice). */
const COIL_FULL_OUTPUT_DT_K = 10;
const HEAT_SOURCES: readonly HeatSource[] = heatSourceKinds;

interface Derived {
  n: number;
  densityKgPerM3: number;
  massKg: number; // per node
  cp: number; // J/(kg·K)
  capJPerK: number; // per node
  lossWPerKNode: number;
  axialWPerK: number;
  immersionNode: number;
  coilNodes: number;
  maxFlowC: number;
  immersionStatC: number;
  /** How the main source's heat enters the water (null: there is none). */
  exchanger: HeatSourceCapabilities['exchanger'];
}

const derivedCache = new WeakMap<TankSpec, Derived>();
let scratchSum = new Float64Array(64);
let scratchCount = new Int32Array(64);

function integerIn(field: string, value: unknown, lo: number, hi: number): number {
  const v = finite(field, value, `a whole number from ${lo} to ${hi}`);
  if (!Number.isInteger(v) || v < lo || v > hi) {
    throw new ThermalInputError(field, `${field} is ${v}: it must be a whole number from ${lo} to ${hi}.`);
  }
  return v;
}

function fraction(field: string, value: unknown): number {
  const v = finite(field, value, 'a fraction from 0 (bottom) to 1 (top)');
  if (v < 0 || v > 1)
    throw new ThermalInputError(field, `${field} is ${v}: it must be a fraction from 0 (bottom) to 1 (top).`);
  return v;
}

function derive(spec: TankSpec): Derived {
  const cached = derivedCache.get(spec);
  if (cached) return cached;
  if (typeof spec !== 'object' || spec === null) {
    throw new ThermalInputError('spec', 'spec is missing: a tank specification object is required.');
  }
  const volumeL = positive('spec.volumeL', spec.volumeL, 'litres');
  const sensorCount = integerIn('spec.sensorCount', spec.sensorCount, 1, 64);
  const heightM = positive('spec.heightM', spec.heightM, 'metres');
  const ambientC = finite('spec.ambientC', spec.ambientC, 'a temperature in °C');
  if (ambientC < -40 || ambientC > 60) {
    throw new ThermalInputError(
      'spec.ambientC',
      `spec.ambientC is ${ambientC} °C: the air around a cylinder must be between −40 and 60 °C.`,
    );
  }
  const ua = nonNegative('spec.uaWPerK', spec.uaWPerK, 'W/K');
  if (!HEAT_SOURCES.includes(spec.heatSource)) {
    throw new ThermalInputError(
      'spec.heatSource',
      `spec.heatSource is ${String(spec.heatSource)}: it must be one of ${HEAT_SOURCES.join(', ')}.`,
    );
  }
  nonNegative('spec.hpOutputW', spec.hpOutputW, 'W');
  nonNegative('spec.immersionW', spec.immersionW, 'W');
  const immFrac = fraction('spec.immersionHeightFrac', spec.immersionHeightFrac);
  const n = spec.nodes === undefined ? Math.max(sensorCount, 12) : integerIn('spec.nodes', spec.nodes, 1, 400);
  const source = capabilities(spec.heatSource);
  const maxFlowC = spec.maxFlowC === undefined ? (source.boiler ? 70 : 55) : waterTemp('spec.maxFlowC', spec.maxFlowC);
  const immersionStatC = spec.immersionStatC === undefined ? 65 : waterTemp('spec.immersionStatC', spec.immersionStatC);
  const coilFrac = spec.coilHeightFrac === undefined ? 0.3 : fraction('spec.coilHeightFrac', spec.coilHeightFrac);

  const rho = waterDensity(MODEL_PROPERTY_C);
  const cp = waterCp(MODEL_PROPERTY_C);
  const massKg = ((volumeL / 1000) * rho) / n;
  const areaM2 = volumeL / 1000 / heightM;
  const d: Derived = {
    n,
    densityKgPerM3: rho,
    massKg,
    cp,
    capJPerK: massKg * cp,
    lossWPerKNode: ua / n,
    axialWPerK: (AXIAL_CONDUCTIVITY_W_PER_MK * areaM2) / (heightM / n),
    immersionNode: Math.min(n - 1, Math.floor(immFrac * n)),
    coilNodes: Math.max(1, Math.round(coilFrac * n)),
    maxFlowC,
    immersionStatC,
    exchanger: source.exchanger,
  };
  if (scratchSum.length < n) {
    scratchSum = new Float64Array(n);
    scratchCount = new Int32Array(n);
  }
  derivedCache.set(spec, d);
  return d;
}

/** Number of internal nodes the model uses for `spec`. */
export function tankNodeCount(spec: TankSpec): number {
  return derive(spec).n;
}

/**
 * A new tank state. `initialC` is one temperature for every node (°C), or a profile
 * bottom to top with either one value per node or one per sensor (interpolated to the nodes).
 */
export function createTank(spec: TankSpec, initialC: number | number[]): TankState {
  const d = derive(spec);
  if (typeof initialC === 'number') {
    return { nodesC: new Array<number>(d.n).fill(waterTemp('initialC', initialC)) };
  }
  if (!Array.isArray(initialC) || (initialC.length !== d.n && initialC.length !== spec.sensorCount)) {
    throw new ThermalInputError(
      'initialC',
      `initialC must be one temperature in °C or an array of ${d.n} node or ${spec.sensorCount} sensor temperatures, bottom to top.`,
    );
  }
  const values = initialC.map((t, i) => waterTemp(`initialC[${i}]`, t));
  return { nodesC: values.length === d.n ? values : resample(values, d.n) };
}

/** Stored energy of a model state above `refC` (°C, default 0), J, with the model's constant properties (negative below `refC`). */
export function tankEnergyJ(spec: TankSpec, state: TankState, refC = 0): number {
  const d = derive(spec);
  checkState(d, state);
  let sum = 0;
  for (const t of state.nodesC) sum += t - refC;
  return sum * d.capJPerK;
}

/** Temperatures at the spec's sensors (sensorCount values, bottom to top, °C), interpolated between node centres. */
export function sensorReadings(spec: TankSpec, state: TankState): number[] {
  const d = derive(spec);
  checkState(d, state);
  return resample(state.nodesC, spec.sensorCount);
}

/** Advance the tank by one step; `state` is left untouched. See {@link stepTankInPlace}. */
export function stepTank(spec: TankSpec, state: TankState, inputs: StepInputs): StepResult {
  return stepTankInPlace(spec, { nodesC: state.nodesC.slice() }, inputs);
}

/**
 * Advance the tank by one step, updating `state.nodesC` in place (for long simulations);
 * the returned `state` is the same object.
 */
export function stepTankInPlace(spec: TankSpec, state: TankState, inputs: StepInputs): StepResult {
  const d = derive(spec);
  checkState(d, state);
  record('inputs', inputs, '{ dtS, coldC, drawLpm, hpOn, immersionOn }');
  const dt = positive('inputs.dtS', inputs.dtS, 'seconds');
  if (typeof inputs.hpOn !== 'boolean' || typeof inputs.immersionOn !== 'boolean') {
    const field = typeof inputs.hpOn !== 'boolean' ? 'inputs.hpOn' : 'inputs.immersionOn';
    throw new ThermalInputError(field, `${field} must be true or false.`);
  }
  const coldC = waterTemp('inputs.coldC', inputs.coldC);
  const drawLpm = nonNegative('inputs.drawLpm', inputs.drawLpm, 'litres per minute');
  const flowC = inputs.hpFlowC === undefined ? d.maxFlowC : waterTemp('inputs.hpFlowC', inputs.hpFlowC);
  const hpW = inputs.hpOutputW === undefined ? spec.hpOutputW : nonNegative('inputs.hpOutputW', inputs.hpOutputW, 'W');
  const immW =
    inputs.immersionPowerW === undefined
      ? spec.immersionW
      : Math.min(spec.immersionW, nonNegative('inputs.immersionPowerW', inputs.immersionPowerW, 'W'));
  const T = state.nodesC;

  // 1. Draw.
  let drawnJ = 0;
  let outletC = 0;
  const drawMassKg = ((drawLpm * dt) / 60 / 1000) * d.densityKgPerM3;
  if (drawMassKg > 0) {
    const sub = Math.ceil(drawMassKg / d.massKg);
    const f = drawMassKg / d.massKg / sub;
    let outSum = 0;
    for (let s = 0; s < sub; s++) {
      const top = T[d.n - 1]!;
      outSum += top;
      drawnJ += f * d.capJPerK * (top - coldC);
      for (let i = d.n - 1; i > 0; i--) T[i] = T[i]! + f * (T[i - 1]! - T[i]!);
      T[0] = T[0]! + f * (coldC - T[0]!);
    }
    outletC = outSum / sub;
  }

  // 2. Main heat source.
  let hpHeatJ = 0;
  if (inputs.hpOn && hpW > 0) {
    if (d.exchanger === 'plate_ports') hpHeatJ = plateHeat(d, T, hpW * dt, flowC);
    else if (d.exchanger === 'coil') hpHeatJ = coilHeat(d, T, hpW, dt, flowC);
  }

  // 3. Immersion element, held back by its own thermostat.
  let immersionHeatJ = 0;
  if (inputs.immersionOn && immW > 0) {
    const k = d.immersionNode;
    const room = d.capJPerK * (d.immersionStatC - T[k]!);
    if (room > 0) {
      immersionHeatJ = Math.min(immW * dt, room);
      T[k] = T[k]! + immersionHeatJ / d.capJPerK;
    }
  }

  // 4. Standing loss: each node decays exactly towards ambient.
  let lossJ = 0;
  if (d.lossWPerKNode > 0) {
    const keep = Math.exp((-d.lossWPerKNode * dt) / d.capJPerK);
    const amb = spec.ambientC;
    for (let i = 0; i < d.n; i++) {
      const before = T[i]!;
      const after = amb + (before - amb) * keep;
      lossJ += d.capJPerK * (before - after);
      T[i] = after;
    }
  }

  // 5. Axial conduction, sub-stepped so the explicit scheme stays stable.
  if (d.n > 1) {
    const r = (d.axialWPerK * dt) / d.capJPerK;
    const sub = Math.max(1, Math.ceil(r / 0.2));
    const rs = r / sub;
    for (let s = 0; s < sub; s++) {
      for (let i = 0; i < d.n - 1; i++) {
        const q = rs * (T[i + 1]! - T[i]!);
        T[i] = T[i]! + q;
        T[i + 1] = T[i + 1]! - q;
      }
    }
  }

  // 6. Buoyancy.
  mixInversions(T, d.n);

  if (drawMassKg === 0) outletC = T[d.n - 1]!;
  return { state, heatInJ: hpHeatJ + immersionHeatJ, hpHeatJ, immersionHeatJ, drawnJ, lossJ, outletC };
}

// Plate heat exchanger: the loop takes water from the bottom and returns it at `flowC` to the top,
// so the column moves down. Heat is limited by the source output and by the loop's flow.
function plateHeat(d: Derived, T: number[], budgetJ: number, flowC: number): number {
  let remainingJ = budgetJ;
  let remainingKg = budgetJ / (d.cp * PLATE_MIN_RISE_K);
  let added = 0;
  for (let guard = 0; guard < 4 * d.n + 8 && remainingJ > budgetJ * 1e-12 && remainingKg > 0; guard++) {
    const rise = flowC - T[0]!;
    if (rise <= 1e-9) break;
    const kg = Math.min(remainingKg, remainingJ / (d.cp * rise), d.massKg);
    const f = kg / d.massKg;
    const q = f * d.capJPerK * rise;
    for (let i = 0; i < d.n - 1; i++) T[i] = T[i]! + f * (T[i + 1]! - T[i]!);
    T[d.n - 1] = T[d.n - 1]! + f * (flowC - T[d.n - 1]!);
    added += q;
    remainingJ -= q;
    remainingKg -= kg;
  }
  return added;
}

// Coil in the bottom zone: each coil node takes heat in proportion to how far it is below the
// flow temperature, never above it, and the total never exceeds the source output.
function coilHeat(d: Derived, T: number[], powerW: number, dt: number, flowC: number): number {
  const k = d.coilNodes;
  const uaNode = powerW / COIL_FULL_OUTPUT_DT_K / k;
  let wanted = 0;
  for (let i = 0; i < k; i++) {
    const gap = flowC - T[i]!;
    if (gap > 0) wanted += Math.min(uaNode * gap * dt, d.capJPerK * gap);
  }
  if (wanted <= 0) return 0;
  const scale = Math.min(1, (powerW * dt) / wanted);
  let added = 0;
  for (let i = 0; i < k; i++) {
    const gap = flowC - T[i]!;
    if (gap > 0) {
      const q = scale * Math.min(uaNode * gap * dt, d.capJPerK * gap);
      T[i] = T[i]! + q / d.capJPerK;
      added += q;
    }
  }
  return added;
}

// Warmer water below cooler water rises: merge adjacent inverted nodes into blocks at their
// mean temperature (pool-adjacent-violators; nodes have equal mass, so energy is conserved).
function mixInversions(T: number[], n: number): void {
  let inverted = false;
  for (let i = 0; i < n - 1; i++) {
    if (T[i]! > T[i + 1]!) {
      inverted = true;
      break;
    }
  }
  if (!inverted) return;
  const sum = scratchSum;
  const count = scratchCount;
  let blocks = 0;
  for (let i = 0; i < n; i++) {
    sum[blocks] = T[i]!;
    count[blocks] = 1;
    blocks++;
    while (blocks > 1 && sum[blocks - 2]! / count[blocks - 2]! > sum[blocks - 1]! / count[blocks - 1]!) {
      sum[blocks - 2] = sum[blocks - 2]! + sum[blocks - 1]!;
      count[blocks - 2] = count[blocks - 2]! + count[blocks - 1]!;
      blocks--;
    }
  }
  let i = 0;
  for (let b = 0; b < blocks; b++) {
    const mean = sum[b]! / count[b]!;
    for (let c = 0; c < count[b]!; c++) T[i++] = mean;
  }
}

function checkState(d: Derived, state: TankState): void {
  const nodes = state?.nodesC;
  if (!Array.isArray(nodes) || nodes.length !== d.n) {
    throw new ThermalInputError(
      'state.nodesC',
      `state.nodesC must be an array of ${d.n} node temperatures in °C (got ${Array.isArray(nodes) ? nodes.length : 'none'}); create it with createTank.`,
    );
  }
  for (let i = 0; i < d.n; i++) {
    const t = nodes[i];
    if (typeof t !== 'number' || !Number.isFinite(t)) {
      throw new ThermalInputError(
        `state.nodesC[${i}]`,
        `state.nodesC[${i}] is ${String(t)}: every node temperature must be a finite number in °C.`,
      );
    }
  }
}

// Linear interpolation between evenly spaced cell centres, holding the end values.
function resample(values: readonly number[], count: number): number[] {
  const m = values.length;
  const out = new Array<number>(count);
  for (let j = 0; j < count; j++) {
    const x = ((j + 0.5) / count) * m - 0.5;
    if (x <= 0) out[j] = values[0]!;
    else if (x >= m - 1) out[j] = values[m - 1]!;
    else {
      const i = Math.floor(x);
      const f = x - i;
      out[j] = values[i]! + (values[i + 1]! - values[i]!) * f;
    }
  }
  return out;
}
