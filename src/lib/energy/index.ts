// Public entry of the energy core: tariffs, energy and cost accounting, demand learning, the charge
// planner and solar diversion. Pure computations, no I/O. Modules inside this folder are private.
// Units everywhere: energy kWh, power W, prices pence per kWh (p/kWh), money pence, volumes litres
// (demand and V40 as litres of mixed water at 40 °C), times epoch ms (UTC), temperatures °C.
export { EnergyInputError } from './errors.js';
// The browser-safe part (units, the home's clock, tariff schemas and prices), then what only the server uses.
export * from './browser.js';
export { importPriceSeries } from './tariff.js';
export { parseHalfHourlyCsv } from './tariff-csv.js';
export type { TariffRowError, HalfHourlyCsvOptions } from './tariff-csv.js';

export { accountDay, rollUpMonths } from './accounting.js';
export type { EnergyReading, AccountingTank, AccountDayOptions, DayEnergy, MonthEnergy } from './accounting.js';

export { HOURS_PER_WEEK, occupantScale, demandPrior, learnDemand, demandSeries } from './demand.js';
export type { DemandModel, LearnDemandOptions } from './demand.js';

export { planCharge } from './planner.js';
export type {
  ChargePlanInput,
  ChargePlan,
  PlanStep,
  BaselineResult,
  HeatSourceLimits,
  CompressorMemory,
  PlannerTuning,
} from './planner.js';
export { buildPlanModel, v40Curve } from './plan-model.js';
export type { PlanModel, PlanModelInput, PlanAction, Transition, V40Curve } from './plan-model.js';
export { solveDp } from './plan-dp.js';
export type { DpResult, DpSettings, StartMemory } from './plan-dp.js';
export type {
  BaselineRule,
  Controller,
  SimulationInput,
  Simulation,
  SimulatedStep,
  SourceCommand,
} from './plan-simulation.js';
export { commandSchedule } from './schedule.js';
export type { CommandWindow } from './schedule.js';

export { solarDiversion } from './solar.js';
export type { DiversionInput, Diversion } from './solar.js';
