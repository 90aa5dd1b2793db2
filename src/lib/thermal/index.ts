// Public entry of the thermal engineering core: pure computations on layer temperatures, no I/O.
// Units everywhere: °C, litres, kWh (J inside the tank model), W, metres, times as epoch ms.
// Layer arrays run bottom to top. Modules inside this folder are private to it.
export { ThermalInputError } from './errors.js';

export { if97Region1, waterDensity, waterCp, waterEnthalpy } from './water.js';
export type { If97Region1 } from './water.js';

export { storedEnergyKWh, mixedWaterLitres, stateOfCharge } from './energy.js';
export type { LayerProfile } from './energy.js';

export { mixNumber, thermocline } from './stratification.js';
export type { Thermocline } from './stratification.js';

export {
  ntcResistance,
  ntcTemperature,
  steinhartHartTemperature,
  steinhartHartCoefficients,
  thermistorSettings,
} from './ntc.js';
export type { BetaThermistor, SteinhartHart, ThermistorSettings } from './ntc.js';

export { standingLoss } from './standing-loss.js';
export type { CoolingSample, StandingLossResult } from './standing-loss.js';

export { erpClass, erpClassLimitW } from './erp.js';
export type { ErpClass } from './erp.js';

export { compressorCycles, shortCycleViolations } from './cycles.js';
export type { OnOffSample, CompressorRun } from './cycles.js';

export { carnotCop, estimatedCop, dhwCop } from './cop.js';

export { legionellaExposure } from './legionella.js';
export type { LayerSample, LegionellaExposure } from './legionella.js';

export { tappingProfile, TAPPING_QREF_KWH } from './tapping.js';
export type { TappingProfile, TappingDraw, TappingProfileSize, TapType } from './tapping.js';

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

export {
  tankFigures,
  figuresOverTime,
  coldWaterC,
  columnMeanC,
  sensorPositions,
  layerThicknesses,
  EN16147_COLD_C,
  EN16147_DELIVERY_C,
} from './figures.js';
export type { TankGeometry, TankFigures, FiguresQuality, FiguresStatus, FigureOptions } from './figures.js';

export {
  stepStuck,
  initialStuck,
  stuckSensors,
  DEFAULT_STUCK_LIMITS,
} from './sensor-check.js';
export type { SensorFault, SensorLimits, StuckLimits, StuckState } from './sensor-check.js';
