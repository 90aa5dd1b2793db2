// The charge planner: the cheapest on/off schedule of heat pump and immersion over the next
// 24–48 hours that keeps usable hot water (V40) above the householder's comfort floor.
//
// 1. Solve the reduced model exactly by dynamic programming (plan-model.ts, plan-dp.ts).
// 2. Run the schedule through the full tank model (plan-simulation.ts) at sub-steps.
// 3. Where the full model dips below the floor at some step (the reduced model is a stratified
//    idealisation: a real thermocline holds heat below 40 °C that it counts as usable), ask the
//    reduced model for more there (what it expected plus the dip plus a litre) and solve again,
//    until no step dips, the plan stops changing, or maxRepairs; keep the best plan seen (fewest
//    steps below the floor in the full model, then cheapest). The plan returned has been simulated;
//    `floorMet` is the full model's verdict, never the reduced model's.
// 4. Simulate a fixed rule (a thermostat, or a thermostat in a fixed window) for comparison.
import type { TankSpec, TankState } from '../thermal/index.js';
import { capabilities } from '../heat-sources.js';
import { EnergyInputError } from './errors.js';
import { baselineController, simulate } from './plan-simulation.js';
import type { BaselineRule, Simulation, SimulationInput } from './plan-simulation.js';
import { solveDp } from './plan-dp.js';
import type { DpResult } from './plan-dp.js';
import { buildPlanModel, v40Curve } from './plan-model.js';
import type { PlanAction } from './plan-model.js';
import { commandSchedule } from './schedule.js';
import type { CommandWindow } from './schedule.js';
import { epochMs, finite, nonNegative, positive, wholeIn } from './validate.js';
import { DEFAULT_COLD_C } from './units.js';

/** Limits of the heat sources for planning. */
export interface HeatSourceLimits {
  /** Heat-pump thermal output to the tank, W (default spec.hpOutputW; 0 = no heat pump; ignored without one). */ hpOutputW?: number;
  /** Immersion rating, W (default spec.immersionW; 0 = never plan the immersion). */ immersionW?: number;
  /** Least time between two hot-water compressor starts, minutes (default 60: one start an hour). */ minStartSpacingMin?: number;
  /** Highest water temperature the heat pump reaches, °C (default spec.maxFlowC, else 55 for a heat pump, 70 for a boiler). */ hpTopC?: number;
}

/** The compressor just before the plan starts (for the start-spacing rule). */
export interface CompressorMemory {
  /** Running for hot water now. */ running: boolean;
  /** Its last start, epoch ms, or null if none recently. */ lastStartMs: number | null;
}

/** Knobs of the method; defaults suit a domestic cylinder. */
export interface PlannerTuning {
  /** Grid spacing of stored heat, kWh (default 0.05 ≈ 1.5 L of V40). */ gridKWh?: number;
  /** Model sub-steps per plan step in the check simulation (default 6: 5 minutes at 30-minute steps). */ substeps?: number;
  /** Most re-solves after the full-model check (default 6). */ maxRepairs?: number;
  /** Charge per compressor start in the optimisation (not in reported costs), pence (default 0.5; common practice to discourage short runs). */ startPenaltyPence?: number;
  /** Value of each kWh of heat left in the tank at the end, pence (default: the cheapest heat of the horizon, import price over COP, at least 0). */ heatValuePencePerKWh?: number;
}

/** Everything the planner needs. Arrays have one value per step. */
export interface ChargePlanInput {
  spec: TankSpec;
  /** Current tank state (e.g. from createTank with the latest layer readings). */ state: TankState;
  /** Start of the first step, epoch ms, a whole number of steps after midnight UTC. */ startMs: number;
  /** Step length, minutes: 5, 10, 15, 20, 30 (default) or 60. */ stepMin?: number;
  /** Import price of each step, p/kWh (e.g. from importPriceSeries). */ importPence: readonly number[];
  /** Expected draw in each step, litres at 40 °C (e.g. from demandSeries). */ demandLitres40: readonly number[];
  /** Least V40 to keep at every step, litres. */ comfortFloorL40: number;
  /** Heat-pump COP (heat over electricity), one value or one per step (e.g. from estimatedCop). */ cop:
    | number
    | readonly number[];
  /** Cold-water temperature, °C (default 10). */ coldC?: number;
  limits?: HeatSourceLimits;
  compressor?: CompressorMemory;
  /** Fixed rule to compare against (default a thermostat at 1/3 height, target hpTopC − 3 °C, 5 K band). */ baseline?: BaselineRule;
  tuning?: PlannerTuning;
}

/** One step of the plan. */
export interface PlanStep {
  /** Step bounds, epoch ms. */ startMs: number;
  endMs: number;
  heatPump: boolean;
  immersion: boolean;
  /** The heat pump starts at this step. */ heatPumpStart: boolean;
  /** Import price, p/kWh. */ importPence: number;
  /** Expected draw, litres at 40 °C. */ demandLitres40: number;
  /** Expected V40 at the step's end, full tank model, litres. */ expectedV40: number;
  /** Lowest V40 during the step, full tank model, litres. */ lowestV40: number;
  /** Electricity, kWh. */ electricityKWh: number;
  /** Cost, pence. */ costPence: number;
}

/** A simulated fixed rule. */
export interface BaselineResult {
  rule: BaselineRule;
  /** Electricity cost, pence. */ costPence: number;
  /** Electricity, kWh. */ electricityKWh: number;
  /** Heat stored above cold water at the end, kWh. */ endStoredKWh: number;
  /** V40 at each step's end, litres. */ expectedV40: number[];
  /** Steps whose V40 fell below the comfort floor. */ stepsBelowFloor: number[];
  /** Heat-pump starts. */ starts: number;
}

/** The planner's answer. */
export interface ChargePlan {
  steps: PlanStep[];
  /** The plan as command windows. */ schedule: CommandWindow[];
  /** Electricity cost of the plan, pence. */ costPence: number;
  /** Electricity, kWh. */ electricityKWh: number;
  /** Heat stored above cold water at the end, kWh. */ endStoredKWh: number;
  /** Every step stays at or above the comfort floor in the full tank model. */ floorMet: boolean;
  /** Steps that dip below the floor in the full tank model. */ stepsBelowFloor: number[];
  /** Heat-pump starts. */ starts: number;
  /** Re-solves made after full-model checks. */ repairs: number;
  baseline: BaselineResult;
  /** Value given to heat left at the end, pence per kWh. */ heatValuePencePerKWh: number;
  /**
   * Baseline cost minus plan cost, each less its end-of-horizon stored heat at heatValuePencePerKWh
   * (so a plan does not "save" by leaving the tank emptier), pence.
   */ savingsPence: number;
}

const STEP_MINUTES = [5, 10, 15, 20, 30, 60];

function perStep(
  field: string,
  value: number | readonly number[],
  steps: number,
  check: (f: string, v: unknown) => number,
): number[] {
  if (typeof value === 'number') return new Array<number>(steps).fill(check(field, value));
  if (!Array.isArray(value) || value.length !== steps)
    throw new EnergyInputError(field, `${field} must have one value per step (${steps}).`);
  return value.map((v, i) => check(`${field}[${i}]`, v));
}

function belowFloor(sim: Simulation, floor: number): number[] {
  const out: number[] = [];
  sim.steps.forEach((s, t) => {
    if (s.minV40 < floor - 1e-6) out.push(t);
  });
  return out;
}

/**
 * Plan the cheapest heating schedule for the next steps. Throws EnergyInputError naming the first
 * unusable input. The plan is deterministic: the same input always gives the same plan.
 */
export function planCharge(input: ChargePlanInput): ChargePlan {
  const spec = input.spec;
  const stepMin = input.stepMin ?? 30;
  if (!STEP_MINUTES.includes(stepMin))
    throw new EnergyInputError(
      'stepMin',
      `stepMin is ${stepMin}: it must be one of ${STEP_MINUTES.join(', ')} minutes.`,
    );
  const startMs = epochMs('startMs', input.startMs);
  if (startMs % (stepMin * 60_000) !== 0)
    throw new EnergyInputError(
      'startMs',
      `startMs ${new Date(startMs).toISOString()} is not on a ${stepMin}-minute boundary.`,
    );
  const steps = Array.isArray(input.importPence) ? input.importPence.length : 0;
  wholeIn('importPence.length', steps, 1, (7 * 24 * 60) / stepMin);
  const importPence = perStep('importPence', input.importPence, steps, (f, v) => finite(f, v, 'p/kWh'));
  const demand = perStep('demandLitres40', input.demandLitres40, steps, (f, v) => nonNegative(f, v, 'litres at 40 °C'));
  const cop = perStep('cop', input.cop, steps, (f, v) => positive(f, v, 'heat over electricity'));
  const floor = nonNegative('comfortFloorL40', input.comfortFloorL40, 'litres at 40 °C');
  const coldC = finite('coldC', input.coldC ?? DEFAULT_COLD_C, '°C');
  const limits = input.limits ?? {};
  // Only a heat pump is planned as the main source: a boiler's fuel is not the tariff's electricity.
  const hasHpSource = capabilities(spec.heatSource).heatPump;
  const hpOutputW = hasHpSource ? nonNegative('limits.hpOutputW', limits.hpOutputW ?? spec.hpOutputW, 'W') : 0;
  const immersionW = nonNegative('limits.immersionW', limits.immersionW ?? spec.immersionW, 'W');
  const hpTopC = finite(
    'limits.hpTopC',
    limits.hpTopC ?? spec.maxFlowC ?? (capabilities(spec.heatSource).boiler ? 70 : 55),
    '°C',
  );
  const spacingMin = nonNegative('limits.minStartSpacingMin', limits.minStartSpacingMin ?? 60, 'minutes');
  const compressor = input.compressor ?? { running: false, lastStartMs: null };
  const tuning = input.tuning ?? {};
  const gridKWh = positive('tuning.gridKWh', tuning.gridKWh ?? 0.05, 'kWh');
  const substeps = wholeIn('tuning.substeps', tuning.substeps ?? 6, 1, 120);
  const maxRepairs = wholeIn('tuning.maxRepairs', tuning.maxRepairs ?? 6, 0, 50);
  const startPenalty = nonNegative('tuning.startPenaltyPence', tuning.startPenaltyPence ?? 0.5, 'pence');
  const hasHp = hpOutputW > 0;

  const curve = v40Curve(spec, coldC, hasHp ? hpTopC : (spec.immersionStatC ?? 65));
  // Heat left at the end is worth what it would cost to make at the horizon's cheapest price: enough
  // for the plan to fill up in a cheap window near the end, never a reason to heat at an ordinary price.
  const cheapest = Math.min(...importPence.map((p, t) => (hasHp ? p / cop[t]! : p)));
  const heatValue = finite(
    'tuning.heatValuePencePerKWh',
    tuning.heatValuePencePerKWh ?? Math.max(0, cheapest),
    'pence per kWh',
  );

  const spacingSteps = Math.ceil(spacingMin / stepMin - 1e-9);
  const sinceStart =
    compressor.lastStartMs === null
      ? spacingSteps
      : Math.max(0, Math.floor((startMs - compressor.lastStartMs) / (stepMin * 60_000)));
  const memory = {
    running: compressor.running && hasHp,
    stepsSinceStart: Math.min(spacingSteps, sinceStart),
    spacingSteps,
  };
  const model = buildPlanModel({
    spec,
    state: input.state,
    coldC,
    stepMin,
    importPence,
    demandLitres40: demand,
    cop,
    hpOutputW,
    immersionW,
    hpTopC,
    gridKWh,
    curve,
  });
  const simInput: SimulationInput = {
    spec,
    state: input.state,
    startMs,
    stepMin,
    substeps,
    coldC,
    importPence,
    demandLitres40: demand,
    cop,
    hpOutputW,
    hpTopC,
    hpRunning: memory.running,
  };
  const runPlan = (actions: readonly PlanAction[]): Simulation =>
    simulate(simInput, (t) => ({ hp: (actions[t]! & 2) !== 0, immersion: (actions[t]! & 1) !== 0 }));

  const floors = new Array<number>(steps).fill(floor);
  let best: { dp: DpResult; sim: Simulation; below: number[] } | null = null;
  let repairs = 0;
  let lastActions: PlanAction[] = [];
  for (let round = 0; ; round++) {
    const dp = solveDp(model, {
      floorsL40: floors,
      terminalCreditPence: heatValue,
      startPenaltyPence: startPenalty,
      memory,
    });
    const sim = runPlan(dp.actions);
    const below = belowFloor(sim, floor);
    if (
      best === null ||
      below.length < best.below.length ||
      (below.length === best.below.length && sim.costPence < best.sim.costPence)
    )
      best = { dp, sim, below };
    const stuck = best !== null && round > 0 && dp.actions.every((a, t) => a === lastActions[t]);
    lastActions = dp.actions;
    if (below.length === 0 || round >= maxRepairs || stuck) break;
    // Ask the reduced model for more than it expected there by the full model's dip, plus a litre.
    for (const t of below) floors[t] = Math.max(floors[t]!, dp.lowV40[t]! + (floor - sim.steps[t]!.minV40) + 1);
    repairs++;
  }

  const { dp, sim, below } = best;
  const stepMs = stepMin * 60_000;
  const planSteps: PlanStep[] = dp.actions.map((a, t) => {
    const s = sim.steps[t]!;
    return {
      startMs: startMs + t * stepMs,
      endMs: startMs + (t + 1) * stepMs,
      heatPump: (a & 2) !== 0,
      immersion: (a & 1) !== 0,
      heatPumpStart: s.starts > 0,
      importPence: importPence[t]!,
      demandLitres40: demand[t]!,
      expectedV40: s.endV40,
      lowestV40: s.minV40,
      electricityKWh: s.electricityKWh,
      costPence: s.costPence,
    };
  });

  const rule: BaselineRule = input.baseline ?? { kind: 'thermostat', targetC: hpTopC - 3, hysteresisK: 5 };
  const baseSim = simulate(
    simInput,
    baselineController(rule, spec, hasHp, spacingMin * 60_000, compressor.lastStartMs, memory.running),
  );
  const baseline: BaselineResult = {
    rule,
    costPence: baseSim.costPence,
    electricityKWh: baseSim.electricityKWh,
    endStoredKWh: baseSim.endEnergyKWh,
    expectedV40: baseSim.steps.map((s) => s.endV40),
    stepsBelowFloor: belowFloor(baseSim, floor),
    starts: baseSim.startsMs.length,
  };
  return {
    steps: planSteps,
    schedule: commandSchedule(dp.actions, startMs, stepMin),
    costPence: sim.costPence,
    electricityKWh: sim.electricityKWh,
    endStoredKWh: sim.endEnergyKWh,
    floorMet: below.length === 0,
    stepsBelowFloor: below,
    starts: sim.startsMs.length,
    repairs,
    baseline,
    heatValuePencePerKWh: heatValue,
    savingsPence: baseSim.costPence - heatValue * baseSim.endEnergyKWh - (sim.costPence - heatValue * sim.endEnergyKWh),
  };
}
