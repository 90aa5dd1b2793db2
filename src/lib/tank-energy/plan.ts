// The charge planner's input from what is stored about a tank, and its answer for the API. Pure.
import { HALF_HOUR_MS, demandSeries, importPriceSeries, learnDemand, planCharge, v40Curve } from '../energy';
import type { ChargePlan, ChargePlanInput, EnergyReading, Tariffs } from '../energy';
import { createTank, estimatedCop } from '../thermal';
import { capabilities } from '../heat-sources';
import type { PlanResponse } from './contracts';
import { tankColdC, tankSpec, type EnergyTankFacts } from './inputs';
import { scheduleWindows } from './schedule-command';

/**
 * Source temperature for the heat pump's COP while no weather feed exists, °C: the A7 rating point
 * of EN 14511 (from memory), a mild UK winter day.
 */
const PLAN_SOURCE_C = 7;

export interface PlanFacts {
  tank: EnergyTankFacts & { occupants: number | null };
  /** Latest layer temperatures, °C, bottom to top. */ layersC: number[];
  compressor: { running: boolean; lastStartMs: number | null };
  /** The home's recent readings, for demand by hour of week. */ history: readonly EnergyReading[];
  tariffs: Tariffs;
  nowMs: number;
  hours: number;
  comfortFloorL40: number;
  timeZone: string;
}

/** A refusal of a planning request that names the field at fault. */
export class PlanRefusal extends Error {
  constructor(
    readonly code: string,
    readonly field: string,
    message: string,
  ) {
    super(message);
  }
}

export function planInput(f: PlanFacts): ChargePlanInput {
  if (!capabilities(f.tank.heatSource).electricMain) {
    throw new PlanRefusal(
      'NotElectricallyHeated',
      'heatSource',
      'A boiler heats this cylinder on its own programmer. A charge plan schedules heat-pump and immersion electricity against the tariff, so there is nothing here to plan.',
    );
  }
  const spec = tankSpec(f.tank);
  // The home's cold inlet where the company set one, else EN 16147's 10 °C (thermal `coldWaterC`).
  const coldC = tankColdC(f.tank);
  const startMs = Math.ceil(f.nowMs / HALF_HOUR_MS) * HALF_HOUR_MS;
  const steps = f.hours * 2;
  // The heat pump heats to the tank's own target; the planner cannot ask more of it.
  const hpTopC = Math.min(f.tank.targetC, 65);
  const most = v40Curve(spec, coldC, capabilities(spec.heatSource).immersion === 'only' ? 65 : hpTopC).litres40.at(-1)!;
  if (f.comfortFloorL40 > most) {
    throw new PlanRefusal(
      'FloorAboveCapacity',
      'comfortFloorL40',
      `comfortFloorL40 is ${f.comfortFloorL40} L, but this ${f.tank.volumeL} L cylinder holds at most about ${Math.floor(most)} L at 40 °C when full at ${hpTopC} °C. Choose a lower floor.`,
    );
  }
  let importPence: number[];
  try {
    importPence = importPriceSeries(f.tariffs, startMs, steps);
  } catch (cause) {
    throw new PlanRefusal(
      'NoTariffInForce',
      'tariff',
      `${(cause as Error).message} The plan needs a price for every half hour of the next ${f.hours} hours.`,
    );
  }
  const demand = demandSeries(
    learnDemand(f.history, { occupants: f.tank.occupants ?? 2, timeZone: f.timeZone, coldC }),
    startMs,
    steps,
  );
  return {
    spec,
    state: createTank(spec, f.layersC),
    startMs,
    stepMin: 30,
    importPence,
    demandLitres40: demand,
    comfortFloorL40: f.comfortFloorL40,
    cop: estimatedCop({ sinkC: hpTopC, sourceC: PLAN_SOURCE_C }),
    coldC,
    limits: { hpTopC },
    compressor: f.compressor,
  };
}

export function shapePlan(
  input: ChargePlanInput,
  plan: ChargePlan,
  timeZone: string,
  tariffSource: 'home' | 'company',
): PlanResponse {
  return {
    startMs: input.startMs,
    stepMin: input.stepMin ?? 30,
    comfortFloorL40: input.comfortFloorL40,
    steps: plan.steps,
    baselineV40: plan.baseline.expectedV40,
    schedule: plan.schedule,
    windows: scheduleWindows(plan.schedule, input.startMs, timeZone),
    costPence: plan.costPence,
    baselineCostPence: plan.baseline.costPence,
    savingsPence: plan.savingsPence,
    floorMet: plan.floorMet,
    tariffSource,
  };
}

export { planCharge };
