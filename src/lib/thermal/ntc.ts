// NTC thermistors: resistance ↔ temperature, and the resistances a cylinder controller presents
// to a heat pump's hot-water sensor input.
import { ThermalInputError } from './errors.js';
import { finite, positive, record } from './validate.js';

const KELVIN = 273.15;
const T25_K = 298.15;

/** Beta-model thermistor: resistance `r25Ohm` (Ω) at 25 °C and constant `betaK` (K). */
export interface BetaThermistor {
  r25Ohm: number;
  betaK: number;
}
/** Steinhart & Hart (1968) coefficients: 1/T = a + b·ln R + c·(ln R)³, T in K, R in Ω. */
export interface SteinhartHart {
  a: number;
  b: number;
  c: number;
}

function checkSensor(sensor: BetaThermistor, field = 'sensor'): void {
  if (typeof sensor !== 'object' || sensor === null) {
    throw new ThermalInputError(field, `${field} is missing: give { r25Ohm, betaK } of the thermistor.`);
  }
  positive(`${field}.r25Ohm`, sensor.r25Ohm, 'ohms');
  positive(`${field}.betaK`, sensor.betaK, 'kelvin');
}

function celsius(field: string, value: unknown): number {
  const v = finite(field, value, 'a temperature in °C');
  if (v <= -KELVIN + 1 || v > 500) {
    throw new ThermalInputError(field, `${field} is ${v} °C: it must be a temperature between −272 and 500 °C.`);
  }
  return v;
}

/** Resistance of a Beta-model NTC at `tempC` (°C), ohms: R = R25·exp(B·(1/T − 1/298.15 K)). */
export function ntcResistance(tempC: number, sensor: BetaThermistor): number {
  checkSensor(sensor);
  const t = celsius('tempC', tempC) + KELVIN;
  return sensor.r25Ohm * Math.exp(sensor.betaK * (1 / t - 1 / T25_K));
}

/** Temperature of a Beta-model NTC reading `ohm` (Ω), °C: 1/T = 1/298.15 K + ln(R/R25)/B. */
export function ntcTemperature(ohm: number, sensor: BetaThermistor): number {
  checkSensor(sensor);
  const r = positive('ohm', ohm, 'ohms');
  const inv = 1 / T25_K + Math.log(r / sensor.r25Ohm) / sensor.betaK;
  if (inv <= 0)
    throw new ThermalInputError(
      'ohm',
      `ohm is ${r}: that resistance lies outside this thermistor's curve (it would mean a temperature above absolute infinity).`,
    );
  return 1 / inv - KELVIN;
}

/** Temperature from a resistance `ohm` (Ω) by Steinhart & Hart (1968), Deep-Sea Research 15, 497, °C. */
export function steinhartHartTemperature(ohm: number, coefficients: SteinhartHart): number {
  const r = positive('ohm', ohm, 'ohms');
  if (typeof coefficients !== 'object' || coefficients === null) {
    throw new ThermalInputError(
      'coefficients',
      'coefficients are missing: give { a, b, c } of the Steinhart–Hart equation.',
    );
  }
  const a = finite('coefficients.a', coefficients.a);
  const b = finite('coefficients.b', coefficients.b);
  const c = finite('coefficients.c', coefficients.c);
  const l = Math.log(r);
  const inv = a + b * l + c * l * l * l;
  if (!(inv > 0)) {
    throw new ThermalInputError(
      'coefficients',
      `coefficients give 1/T = ${inv} K⁻¹ at ${r} Ω: check a, b and c (1/T must be positive).`,
    );
  }
  return 1 / inv - KELVIN;
}

/** Steinhart–Hart coefficients through three calibration points (resistance Ω, temperature °C), solved exactly. */
export function steinhartHartCoefficients(points: ReadonlyArray<{ ohm: number; tempC: number }>): SteinhartHart {
  if (!Array.isArray(points) || points.length !== 3) {
    throw new ThermalInputError('points', 'points must hold exactly three calibration points { ohm, tempC }.');
  }
  const L = points.map((p, i) => Math.log(positive(`points[${i}].ohm`, p.ohm, 'ohms')));
  const Y = points.map((p, i) => 1 / (celsius(`points[${i}].tempC`, p.tempC) + KELVIN));
  const [l1, l2, l3] = L as [number, number, number];
  const [y1, y2, y3] = Y as [number, number, number];
  if (l1 === l2 || l2 === l3 || l1 === l3) {
    throw new ThermalInputError('points', 'points must have three different resistances.');
  }
  // Steinhart & Hart's closed form for three points.
  const g2 = (y2 - y1) / (l2 - l1);
  const g3 = (y3 - y1) / (l3 - l1);
  const c = (g3 - g2) / (l3 - l2) / (l1 + l2 + l3);
  const b = g2 - c * (l1 * l1 + l1 * l2 + l2 * l2);
  const a = y1 - (b + l1 * l1 * c) * l1;
  return { a, b, c };
}

/** Resistances a cylinder controller presents to a heat pump's hot-water sensor input, ohms. */
export interface ThermistorSettings {
  /** Presented to ask for heat: what the sensor would read at `callC`. */ callOhm: number;
  /** Presented when the cylinder is satisfied: what the sensor would read at `satisfiedC`. */ satisfiedOhm: number;
}

/**
 * The resistances that make a heat pump with a Beta-model NTC input (`sensor`) read `callC`
 * ("cold, heat now") and `satisfiedC` ("hot enough"), both °C, with callC below satisfiedC.
 */
export function thermistorSettings(input: {
  sensor: BetaThermistor;
  callC: number;
  satisfiedC: number;
}): ThermistorSettings {
  record('input', input, '{ sensor, callC, satisfiedC }');
  checkSensor(input.sensor);
  const callC = celsius('callC', input.callC);
  const satisfiedC = celsius('satisfiedC', input.satisfiedC);
  if (callC >= satisfiedC) {
    throw new ThermalInputError(
      'callC',
      `callC is ${callC} °C: the call-for-heat temperature must be below the satisfied temperature (${satisfiedC} °C).`,
    );
  }
  return { callOhm: ntcResistance(callC, input.sensor), satisfiedOhm: ntcResistance(satisfiedC, input.sensor) };
}
