// Run a heating schedule, or a fixed control rule, through the thermal core's tank model at short
// sub-steps, to see what a plan really gives: V40 at every sub-step, heat, electricity and cost.
// Each step's demand is drawn from its start, as fast as a tap allows, until its heat above cold
// water is delivered (what the tank cannot give by the step's end is reported as unmet).
import { mixedWaterLitres, stepTankInPlace, tankEnergyJ, tankNodeCount } from '../thermal/index.js';
import type { TankSpec, TankState } from '../thermal/index.js';
import { localMinuteOfDay } from './local-time.js';
import { J_PER_KWH, kWhPerLitreAt40, V40_DELIVERY_C } from './units.js';

/** Highest draw flow the simulation uses, litres per minute (a bath tap; common practice). */
const MAX_DRAW_LPM = 12;

/** What the sources do during one sub-step. */
export interface SourceCommand {
  hp: boolean;
  immersion: boolean;
}

/** A rule deciding the sources each sub-step from the step index, the time and the tank. */
export type Controller = (step: number, ms: number, state: TankState) => SourceCommand;

/** Inputs of one simulation. Arrays have one value per step. */
export interface SimulationInput {
  spec: TankSpec;
  /** Starting state (copied, not changed). */ state: TankState;
  /** Start of step 0, epoch ms. */ startMs: number;
  /** Step length, minutes. */ stepMin: number;
  /** Sub-steps per step (the model is stepped stepMin/substeps minutes at a time). */ substeps: number;
  /** Cold-water temperature, °C. */ coldC: number;
  /** Import price of each step, p/kWh. */ importPence: readonly number[];
  /** Demand of each step, litres at 40 °C. */ demandLitres40: readonly number[];
  /** Heat-pump COP of each step. */ cop: readonly number[];
  /** Heat-pump thermal output, W. */ hpOutputW: number;
  /** Heat-pump top (flow) temperature, °C. */ hpTopC: number;
  /** The heat pump was already running when step 0 starts (continuing is not a start). */ hpRunning: boolean;
}

/** One step of a simulated schedule. */
export interface SimulatedStep {
  /** Lowest V40 at any sub-step end, litres. */ minV40: number;
  /** V40 at the step's end, litres. */ endV40: number;
  /** Heat from the heat pump, kWh. */ hpHeatKWh: number;
  /** Heat from the immersion, kWh. */ immersionHeatKWh: number;
  /** Electricity, kWh. */ electricityKWh: number;
  /** Cost, pence. */ costPence: number;
  /** Heat-pump starts in the step. */ starts: number;
  /** Demand the tank could not deliver, litres at 40 °C. */ unmetLitres40: number;
  /** Whether each source ran at any time in the step. */ hp: boolean;
  immersion: boolean;
}

/** A whole simulated schedule. */
export interface Simulation {
  steps: SimulatedStep[];
  /** Total electricity, kWh. */ electricityKWh: number;
  /** Total cost, pence. */ costPence: number;
  /** Heat stored above cold water at the end, kWh. */ endEnergyKWh: number;
  /** Start times of the heat pump, epoch ms. */ startsMs: number[];
}

/** Simulate `controller` through the tank model. */
export function simulate(input: SimulationInput, controller: Controller): Simulation {
  const { spec, coldC } = input;
  const state: TankState = { nodesC: input.state.nodesC.slice() };
  const n = tankNodeCount(spec);
  const subS = (input.stepMin * 60) / input.substeps;
  const k40J = kWhPerLitreAt40(coldC) * J_PER_KWH;
  const v40 = (): number =>
    mixedWaterLitres({ layersC: state.nodesC, volumeL: spec.volumeL, coldC, deliveryC: V40_DELIVERY_C });
  const steps: SimulatedStep[] = [];
  const startsMs: number[] = [];
  let hpWasOn = input.hpRunning,
    totalE = 0,
    totalC = 0;
  for (let t = 0; t < input.importPence.length; t++) {
    let owedJ = input.demandLitres40[t]! * k40J;
    const s: SimulatedStep = {
      minV40: Infinity,
      endV40: 0,
      hpHeatKWh: 0,
      immersionHeatKWh: 0,
      electricityKWh: 0,
      costPence: 0,
      starts: 0,
      unmetLitres40: 0,
      hp: false,
      immersion: false,
    };
    for (let u = 0; u < input.substeps; u++) {
      const ms = input.startMs + (t * input.substeps + u) * subS * 1000;
      const cmd = controller(t, ms, state);
      if (cmd.hp && !hpWasOn) {
        s.starts++;
        startsMs.push(ms);
      }
      hpWasOn = cmd.hp;
      let drawLpm = 0;
      if (owedJ > 0) {
        const lift = state.nodesC[n - 1]! - coldC;
        // Litres of top water that carry the owed heat, at 1 kg/L (the model's density is close).
        drawLpm = lift > 0.5 ? Math.min(MAX_DRAW_LPM, owedJ / (4180 * lift) / (subS / 60)) : MAX_DRAW_LPM;
      }
      const r = stepTankInPlace(spec, state, {
        dtS: subS,
        coldC,
        drawLpm,
        hpOn: cmd.hp,
        immersionOn: cmd.immersion,
        hpOutputW: input.hpOutputW,
        hpFlowC: input.hpTopC,
      });
      owedJ -= r.drawnJ;
      s.hpHeatKWh += r.hpHeatJ / J_PER_KWH;
      s.immersionHeatKWh += r.immersionHeatJ / J_PER_KWH;
      s.hp ||= cmd.hp;
      s.immersion ||= cmd.immersion;
      s.minV40 = Math.min(s.minV40, v40());
    }
    s.unmetLitres40 = Math.max(0, owedJ) / k40J;
    s.endV40 = v40();
    s.electricityKWh = s.hpHeatKWh / input.cop[t]! + s.immersionHeatKWh;
    s.costPence = s.electricityKWh * input.importPence[t]!;
    totalE += s.electricityKWh;
    totalC += s.costPence;
    steps.push(s);
  }
  return {
    steps,
    electricityKWh: totalE,
    costPence: totalC,
    endEnergyKWh: Math.max(0, tankEnergyJ(spec, state, coldC) / J_PER_KWH),
    startsMs,
  };
}

/** A fixed rule to compare plans against. Temperatures °C, times local minutes after midnight. */
export type BaselineRule =
  | {
      /** Heat whenever the cylinder thermostat falls below targetC − hysteresisK, until it reaches targetC. */
      kind: 'thermostat';
      /** °C */ targetC: number;
      /** K */ hysteresisK: number;
      /** Height of the thermostat, 0 bottom … 1 top (default 1/3; common practice for a cylinder stat pocket). */ sensorFrac?: number;
    }
  | {
      /** The same thermostat, allowed to call for heat only inside a daily local-time window. */
      kind: 'window';
      /** °C */ targetC: number;
      /** K */ hysteresisK: number;
      /** Window start, local minutes after midnight. */ startMin: number;
      /** Window end (exclusive), local minutes after midnight; before start when it spans midnight. */ endMin: number;
      /** IANA zone of the window's clock. */ timeZone: string;
      sensorFrac?: number;
    };

/**
 * The controller of a baseline rule: a thermostat on the main source (the immersion on an
 * immersion-only tank) that never starts the heat pump within `spacingMs` of its last start.
 */
export function baselineController(
  rule: BaselineRule,
  spec: TankSpec,
  hasHp: boolean,
  spacingMs: number,
  lastStartMs: number | null,
  running: boolean,
): Controller {
  const n = tankNodeCount(spec);
  const node = Math.min(n - 1, Math.max(0, Math.floor((rule.sensorFrac ?? 1 / 3) * n)));
  let calling = running;
  let on = running;
  let last = lastStartMs ?? -Infinity;
  return (_step, ms, state) => {
    const t = state.nodesC[node]!;
    if (t < rule.targetC - rule.hysteresisK) calling = true;
    else if (t >= rule.targetC) calling = false;
    let allowed = true;
    if (rule.kind === 'window') {
      const m = localMinuteOfDay(ms, rule.timeZone);
      allowed =
        rule.startMin < rule.endMin ? m >= rule.startMin && m < rule.endMin : m >= rule.startMin || m < rule.endMin;
    }
    let want = calling && allowed;
    if (hasHp && want && !on && ms - last < spacingMs) want = false;
    if (hasHp && want && !on) last = ms;
    on = want;
    return hasHp ? { hp: want, immersion: false } : { hp: false, immersion: want };
  };
}
