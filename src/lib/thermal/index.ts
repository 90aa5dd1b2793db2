// Public entry of the thermal engineering core. Everything other code uses is exported here;
// modules inside this folder are private to it.
export { ThermalInputError } from './errors.js';
export {
  if97Region1,
  waterDensity,
  waterCp,
  waterEnthalpy,
  CYLINDER_PRESSURE_MPA,
} from './water.js';
export type { If97Region1 } from './water.js';
export {
  createTank,
  stepTank,
  stepTankInPlace,
  sensorReadings,
  tankEnergyJ,
  tankNodeCount,
  MODEL_PROPERTY_C,
} from './tank-model.js';
export type { TankSpec, TankState, StepInputs, StepResult, HeatSource } from './tank-model.js';
