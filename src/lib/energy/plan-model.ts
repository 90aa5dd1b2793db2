// The charge planner's reduced tank model and its discretisation (shared by the dynamic programme,
// and by the brute-force check in the tests).
//
// State: E, heat stored above cold water, kWh, plus compressor memory (see plan-dp.ts). One step:
//   1. the step's demand D is drawn first:            E1 = max(0, E − D)
//   2. the heat pump adds      qh = min(P_hp·h, max(0, E_hp − E1))       (if on)
//   3. the immersion adds      qi = min(P_im·h, max(0, E_im − E1 − qh))  (if on)
//   4. standing loss, exactly as the tank model: the mean temperature decays towards ambient,
//      E' = a·(E1 + qh + qi) + b,  a = exp(−UA·h/C),  b = C·(T_amb − T_cold)·(1 − a).
// E_hp is the tank full at the heat pump's top temperature; E_im adds the part above the element
// at the element's thermostat. Electricity is qh/COP + qi, its cost at the step's import price.
// Usable water: V40 as a function of E, measured on the tank model itself (v40Curve below): a full
// tank drawn down with no heat, V40 recorded against E on the way. Heat in the thermocline's
// lukewarm water is not usable, so V40(E) lies below E/k40 (k40: heat in one litre at 40 °C); above
// the curve's top every further kWh is usable (E/k40 slope).
// The comfort floor is checked after the draw and the step's loss but before any heat: the lowest the
// tank can fall during the step if the draw comes first, so it holds whatever the order.
//
// Discretisation: E lives on a grid that decays with the tank. At step t the grid points are
// E = α_t·j·δ + β_t (α_0 = 1, β_0 = 0, α_{t+1} = a·α_t, β_{t+1} = a·β_t + b), so a step with no draw
// and no heat maps grid point j exactly onto grid point j: standing loss is never rounded away. Only
// steps with a draw or heat round, to the nearest grid point (error at most half a grid spacing).
// Every transition is monotone in E (more stored heat never ends with less), so the grid model ranks
// schedules as the continuous one does up to that rounding; the plan is then checked, and repaired,
// through the full tank model (planner.ts).
import {
  MODEL_PROPERTY_C,
  createTank,
  mixedWaterLitres,
  stepTankInPlace,
  tankEnergyJ,
  tankNodeCount,
  waterCp,
  waterDensity,
} from '../thermal/index.js';
import type { TankSpec, TankState } from '../thermal/index.js';
import { capabilities } from '../heat-sources.js';
import { J_PER_KWH, V40_DELIVERY_C, kWhPerLitreAt40 } from './units.js';

/** A step's action: bit 2 heat pump, bit 1 immersion (0 none, 1 immersion, 2 heat pump, 3 both). */
export type PlanAction = 0 | 1 | 2 | 3;
/** All actions, in the order ties are broken (cheapest to run first). */
const PLAN_ACTIONS: readonly PlanAction[] = [0, 1, 2, 3];

/** The reduced, discretised model of one planning problem. Energies kWh, prices p/kWh. */
export interface PlanModel {
  /** Number of steps. */ steps: number;
  /** Step length, hours. */ stepH: number;
  /** Grid spacing at step 0, kWh. */ gridKWh: number;
  /** Lowest and highest grid index. */ jMin: number;
  jMax: number;
  /** Grid index of the initial state. */ j0: number;
  /** Which actions the heat sources allow (immersion-only tanks have no heat pump). */ actions: readonly PlanAction[];
  /** Energy of grid point j at step t (0 ≤ t ≤ steps), kWh. */ energyAt(t: number, j: number): number;
  /** Outcome of `action` at step t from grid point j: next index, electricity (kWh), cost (pence), model V40 at the step's low point (L), heat in (kWh). */
  transition(t: number, j: number, action: PlanAction): Transition;
  /** Every transition of step t, j from jMin to jMax by action in `actions` order, into the arrays (next index, cost in pence, low-point V40). */
  fillStep(t: number, nextOut: Int32Array, costOut: Float64Array, lowOut: Float64Array): void;
  /** The model's V40 of stored energy E, litres (non-decreasing in E). */ v40Of(energyKWh: number): number;
  /** Heat in one litre at 40 °C, kWh. */ k40: number;
}

/** One step of the model. */
export interface Transition {
  next: number;
  electricityKWh: number;
  costPence: number;
  lowV40: number;
  heatKWh: number;
}

/** What the model needs to know of one planning problem. */
export interface PlanModelInput {
  spec: TankSpec;
  state: TankState;
  coldC: number;
  stepMin: number;
  importPence: readonly number[];
  demandLitres40: readonly number[];
  cop: readonly number[];
  hpOutputW: number;
  immersionW: number;
  hpTopC: number;
  gridKWh: number;
  /** V40 against stored heat, from {@link v40Curve}. */ curve: V40Curve;
}

/** Points (E kWh, V40 L) with E ascending and V40 non-decreasing. */
export interface V40Curve {
  energyKWh: number[];
  litres40: number[];
}

/**
 * V40 against stored heat above cold water for this tank, measured on the tank model: start full
 * (at `topC`, or for an immersion-only tank the part above the element at `topC` and cold below) and
 * draw at 10 L/min with no heat, recording (E, V40) every minute until no water at 40 °C is left.
 */
export function v40Curve(spec: TankSpec, coldC: number, topC: number): V40Curve {
  const n = tankNodeCount(spec);
  const k = Math.min(n - 1, Math.floor(spec.immersionHeightFrac * n));
  const init =
    capabilities(spec.heatSource).immersion === 'only'
      ? Array.from({ length: n }, (_, i) => (i >= k ? topC : coldC))
      : topC;
  const state = createTank(spec, init);
  const e: number[] = [],
    v: number[] = [];
  const volumeL = spec.volumeL;
  for (let guard = 0; guard < 10_000; guard++) {
    const litres = mixedWaterLitres({ layersC: state.nodesC, volumeL, coldC, deliveryC: V40_DELIVERY_C });
    e.push(Math.max(0, tankEnergyJ(spec, state, coldC) / J_PER_KWH));
    v.push(litres);
    if (litres <= 0) break;
    stepTankInPlace(spec, state, { dtS: 60, coldC, drawLpm: 10, hpOn: false, immersionOn: false });
  }
  e.push(0);
  v.push(0);
  e.reverse();
  v.reverse();
  // Make the curve a function: E strictly ascending, V40 non-decreasing.
  const E: number[] = [],
    V: number[] = [];
  for (let i = 0; i < e.length; i++) {
    if (E.length && e[i]! <= E[E.length - 1]!) continue;
    E.push(e[i]!);
    V.push(Math.max(v[i]!, V.length ? V[V.length - 1]! : 0));
  }
  return { energyKWh: E, litres40: V };
}

/** Fraction of the nodes at and above the immersion element (the part it can heat). */
function immersionShare(spec: TankSpec): number {
  const n = tankNodeCount(spec);
  const k = Math.min(n - 1, Math.floor(spec.immersionHeightFrac * n));
  return (n - k) / n;
}

/** Heat capacity of the stored water, kWh/K, with the tank model's properties. */
function capacityKWhPerK(spec: TankSpec): number {
  return ((spec.volumeL / 1000) * waterDensity(MODEL_PROPERTY_C) * waterCp(MODEL_PROPERTY_C)) / J_PER_KWH;
}

/** Build the reduced model; inputs already validated by the planner. */
export function buildPlanModel(p: PlanModelInput): PlanModel {
  const steps = p.importPence.length;
  const stepH = p.stepMin / 60;
  const cap = capacityKWhPerK(p.spec);
  const a = Math.exp((-p.spec.uaWPerK * stepH * 3600) / (cap * J_PER_KWH));
  const b = cap * (p.spec.ambientC - p.coldC) * (1 - a);
  const hasHp = p.hpOutputW > 0 && capabilities(p.spec.heatSource).heatPump;
  const hasImm = p.immersionW > 0;
  const statC = p.spec.immersionStatC ?? 65;
  const share = immersionShare(p.spec);
  const eHp = hasHp ? cap * Math.max(0, p.hpTopC - p.coldC) : 0;
  const lowerC = hasHp ? p.hpTopC : p.coldC;
  const eIm = hasImm ? cap * (share * Math.max(0, statC - p.coldC) + (1 - share) * Math.max(0, lowerC - p.coldC)) : 0;
  const e0 = Math.max(0, tankEnergyJ(p.spec, p.state, p.coldC) / J_PER_KWH);
  const k40 = kWhPerLitreAt40(p.coldC);
  // V40(E) tabulated on a fine uniform grid for O(1) lookups in the programme's inner loop.
  const TABLE_KWH = 0.01;
  const cE = p.curve.energyKWh,
    cV = p.curve.litres40;
  const eTop = cE[cE.length - 1]!,
    vTop = cV[cV.length - 1]!;
  const table = new Float64Array(Math.ceil(eTop / TABLE_KWH) + 2);
  for (let i = 0, seg = 0; i < table.length; i++) {
    const x = i * TABLE_KWH;
    if (x >= eTop) {
      table[i] = vTop + (x - eTop) / k40;
      continue;
    }
    while (cE[seg + 1]! < x) seg++;
    const f = (x - cE[seg]!) / (cE[seg + 1]! - cE[seg]!);
    table[i] = cV[seg]! + f * (cV[seg + 1]! - cV[seg]!);
  }
  const v40Of = (en: number): number => {
    if (en <= 0) return 0;
    if (en >= eTop) return vTop + (en - eTop) / k40;
    const x = en / TABLE_KWH;
    const i = Math.floor(x);
    return table[i]! + (x - i) * (table[i + 1]! - table[i]!);
  };
  const demandKWh = p.demandLitres40.map((l) => l * k40);

  const alpha = new Float64Array(steps + 1);
  const beta = new Float64Array(steps + 1);
  alpha[0] = 1;
  for (let t = 0; t < steps; t++) {
    alpha[t + 1] = a * alpha[t]!;
    beta[t + 1] = a * beta[t]! + b;
  }
  const delta = p.gridKWh;
  const top = Math.max(eHp, eIm, e0) + delta;
  // Index range covering [0, top] at every step (β may push the grid up or down a little).
  let jMin = 0,
    jMax = 0;
  for (let t = 0; t <= steps; t++) {
    jMin = Math.min(jMin, Math.floor((0 - beta[t]!) / (alpha[t]! * delta)));
    jMax = Math.max(jMax, Math.ceil((top - beta[t]!) / (alpha[t]! * delta)));
  }
  const energyAt = (t: number, j: number): number => alpha[t]! * j * delta + beta[t]!;
  const php = hasHp ? (p.hpOutputW * stepH) / 1000 : 0;
  const pim = hasImm ? (p.immersionW * stepH) / 1000 : 0;
  const actions = PLAN_ACTIONS.filter((x) => (hasHp || (x & 2) === 0) && (hasImm || (x & 1) === 0));

  // One step's outcome, written into `out` (no allocation: the programme calls this J·4 times a step).
  const outcome = (t: number, j: number, action: PlanAction, out: Transition): void => {
    const e = alpha[t]! * j * delta + beta[t]!;
    const d = demandKWh[t]!;
    const e1 = e > d ? e - d : 0;
    const qh = action & 2 ? Math.min(php, Math.max(0, eHp - e1)) : 0;
    const qi = action & 1 ? Math.min(pim, Math.max(0, eIm - e1 - qh)) : 0;
    const heat = qh + qi;
    let next = j;
    if (heat !== 0 || d !== 0) {
      next = Math.round((a * (e1 + heat) + b - beta[t + 1]!) / (alpha[t + 1]! * delta));
      if (next < jMin) next = jMin;
      else if (next > jMax) next = jMax;
    }
    const electricity = qh / p.cop[t]! + qi;
    out.next = next;
    out.electricityKWh = electricity;
    out.costPence = electricity * p.importPence[t]!;
    out.lowV40 = v40Of(a * e1 + b);
    out.heatKWh = heat;
  };
  const transition = (t: number, j: number, action: PlanAction): Transition => {
    const out: Transition = { next: 0, electricityKWh: 0, costPence: 0, lowV40: 0, heatKWh: 0 };
    outcome(t, j, action, out);
    return out;
  };
  const scratch: Transition = { next: 0, electricityKWh: 0, costPence: 0, lowV40: 0, heatKWh: 0 };
  const fillStep = (t: number, nextOut: Int32Array, costOut: Float64Array, lowOut: Float64Array): void => {
    let i = 0;
    for (let j = jMin; j <= jMax; j++) {
      for (const action of actions) {
        outcome(t, j, action, scratch);
        nextOut[i] = scratch.next;
        costOut[i] = scratch.costPence;
        lowOut[i] = scratch.lowV40;
        i++;
      }
    }
  };

  return {
    steps,
    stepH,
    gridKWh: delta,
    jMin,
    jMax,
    j0: Math.round(e0 / delta),
    actions,
    energyAt,
    transition,
    fillStep,
    v40Of,
    k40,
  };
}
