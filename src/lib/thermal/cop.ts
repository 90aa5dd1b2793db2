// Heat-pump coefficients of performance.
import { ThermalInputError } from './errors.js';
import { finite, nonNegative, positive, record } from './validate.js';

const KELVIN = 273.15;

function temperature(field: string, value: unknown): number {
  const v = finite(field, value, 'a temperature in °C');
  if (v < -60 || v > 150) throw new ThermalInputError(field, `${field} is ${v} °C: it must be between −60 and 150 °C.`);
  return v;
}

/** Ideal (Carnot) heating COP between a source at `sourceC` and a sink at `sinkC` (°C): T_sink/(T_sink − T_source) in kelvin. */
export function carnotCop(input: { sinkC: number; sourceC: number }): number {
  record('input', input, '{ sinkC, sourceC }');
  const sink = temperature('sinkC', input.sinkC);
  const source = temperature('sourceC', input.sourceC);
  if (sink <= source) {
    throw new ThermalInputError(
      'sinkC',
      `sinkC is ${sink} °C: the sink (water) must be warmer than the source (${source} °C) for a heating COP.`,
    );
  }
  return (sink + KELVIN) / (sink - source);
}

/**
 * Estimated real COP: `qualityGrade` × Carnot COP. A grade of about 0.4 for air-source heat pumps
 * is a commonly used figure (common practice); pass your own where it is known.
 */
export function estimatedCop(input: { sinkC: number; sourceC: number; qualityGrade?: number }): number {
  record('input', input, '{ sinkC, sourceC, qualityGrade? }');
  const grade =
    input.qualityGrade === undefined
      ? 0.4
      : positive('qualityGrade', input.qualityGrade, 'a fraction of the Carnot COP');
  if (grade > 1)
    throw new ThermalInputError(
      'qualityGrade',
      `qualityGrade is ${grade}: no heat pump beats Carnot, so it must be at most 1.`,
    );
  return grade * carnotCop(input);
}

/** Hot-water COP over a period: heat delivered to the cylinder (kWh) over electricity used (kWh). */
export function dhwCop(input: { heatDeliveredKWh: number; electricityKWh: number }): number {
  record('input', input, '{ heatDeliveredKWh, electricityKWh }');
  const heat = nonNegative('heatDeliveredKWh', input.heatDeliveredKWh, 'kWh');
  const elec = positive('electricityKWh', input.electricityKWh, 'kWh');
  return heat / elec;
}
