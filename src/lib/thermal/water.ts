// Properties of liquid water from the IAPWS Industrial Formulation 1997 (IAPWS-IF97),
// region 1 (IAPWS R7-97(2012), equations 7 and table 2 coefficients, table 3 relations).
// No npm package provides IF97 cleanly, so region 1 is implemented here and checked
// against the release's verification table (table 5).
import { ThermalInputError } from './errors.js';
import { finite, waterTemp } from './validate.js';

/** Specific gas constant of water in IF97, kJ/(kg·K). */
const R = 0.461526;
const P_STAR_MPA = 16.53;
const T_STAR_K = 1386;

// [I, J, n] of IF97 table 2.
const COEFFS: ReadonlyArray<readonly [number, number, number]> = [
  [0, -2, 0.14632971213167],
  [0, -1, -0.84548187169114],
  [0, 0, -0.3756360367204e1],
  [0, 1, 0.33855169168385e1],
  [0, 2, -0.95791963387872],
  [0, 3, 0.15772038513228],
  [0, 4, -0.16616417199501e-1],
  [0, 5, 0.81214629983568e-3],
  [1, -9, 0.28319080123804e-3],
  [1, -7, -0.60706301565874e-3],
  [1, -1, -0.18990068218419e-1],
  [1, 0, -0.32529748770505e-1],
  [1, 1, -0.21841717175414e-1],
  [1, 3, -0.5283835796993e-4],
  [2, -3, -0.47184321073267e-3],
  [2, 0, -0.30001780793026e-3],
  [2, 1, 0.47661393906987e-4],
  [2, 3, -0.44141845330846e-5],
  [2, 17, -0.72694996297594e-15],
  [3, -4, -0.31679644845054e-4],
  [3, 0, -0.28270797985312e-5],
  [3, 6, -0.85205128120103e-9],
  [4, -5, -0.22425281908e-5],
  [4, -2, -0.65171222895601e-6],
  [4, 10, -0.14341729937924e-12],
  [5, -8, -0.40516996860117e-6],
  [8, -11, -0.12734301741641e-8],
  [8, -6, -0.17424871230634e-9],
  [21, -29, -0.68762131295531e-18],
  [23, -31, 0.14478307828521e-19],
  [29, -38, 0.26335781662795e-22],
  [30, -39, -0.11947622640071e-22],
  [31, -40, 0.18228094581404e-23],
  [32, -41, -0.93537087292458e-25],
];

/** Region 1 properties at one state point (units as in the IF97 release). */
export interface If97Region1 {
  /** Specific volume, m³/kg. */ specificVolumeM3PerKg: number;
  /** Density, kg/m³. */ densityKgPerM3: number;
  /** Specific enthalpy, kJ/kg. */ enthalpyKJPerKg: number;
  /** Specific internal energy, kJ/kg. */ internalEnergyKJPerKg: number;
  /** Specific entropy, kJ/(kg·K). */ entropyKJPerKgK: number;
  /** Specific isobaric heat capacity, kJ/(kg·K). */ cpKJPerKgK: number;
  /** Speed of sound, m/s. */ speedOfSoundMPerS: number;
}

/**
 * IAPWS-IF97 region 1 (compressed liquid) at temperature `temperatureK` (K) and
 * pressure `pressureMPa` (MPa). Valid for 273.15 K ≤ T ≤ 623.15 K and p_sat(T) ≤ p ≤ 100 MPa;
 * the caller is trusted to stay in the liquid region (checked loosely here).
 */
export function if97Region1(temperatureK: number, pressureMPa: number): If97Region1 {
  const t = finite('temperatureK', temperatureK, 'a temperature in kelvin');
  const p = finite('pressureMPa', pressureMPa, 'a pressure in MPa');
  if (t < 273.15 || t > 623.15) {
    throw new ThermalInputError('temperatureK', `temperatureK is ${t}: IF97 region 1 covers 273.15 K to 623.15 K.`);
  }
  if (p <= 0 || p > 100) {
    throw new ThermalInputError(
      'pressureMPa',
      `pressureMPa is ${p}: IF97 region 1 covers pressures above saturation up to 100 MPa.`,
    );
  }
  const pi = p / P_STAR_MPA;
  const tau = T_STAR_K / t;
  const a = 7.1 - pi;
  const b = tau - 1.222;
  let g = 0,
    gp = 0,
    gpp = 0,
    gt = 0,
    gtt = 0,
    gpt = 0;
  for (const [I, J, n] of COEFFS) {
    const aI = a ** I;
    const bJ = b ** J;
    g += n * aI * bJ;
    const aI1 = I === 0 ? 0 : a ** (I - 1);
    const bJ1 = b ** (J - 1);
    gp -= n * I * aI1 * bJ;
    gpp += I < 2 ? 0 : n * I * (I - 1) * a ** (I - 2) * bJ;
    gt += n * aI * J * bJ1;
    gtt += n * aI * J * (J - 1) * b ** (J - 2);
    gpt -= n * I * aI1 * J * bJ1;
  }
  const rt = R * t; // kJ/kg
  const v = (pi * gp * rt) / (p * 1000); // m³/kg (p in kPa)
  const h = tau * gt * rt;
  const u = rt * (tau * gt - pi * gp);
  const s = R * (tau * gt - g);
  const cp = -R * tau * tau * gtt;
  const w2 = (gp * gp) / ((gp - tau * gpt) ** 2 / (tau * tau * gtt) - gpp);
  return {
    specificVolumeM3PerKg: v,
    densityKgPerM3: 1 / v,
    enthalpyKJPerKg: h,
    internalEnergyKJPerKg: u,
    entropyKJPerKgK: s,
    cpKJPerKgK: cp,
    speedOfSoundMPerS: Math.sqrt(w2 * rt * 1000),
  };
}

/**
 * Pressure at which the cylinder helpers below evaluate water, MPa: 0.3 MPa (3 bar absolute),
 * a typical unvented-cylinder working pressure (common practice). Between 0.1 and 0.3 MPa
 * density changes by under 0.01 %, so vented cylinders are served as well.
 */
const CYLINDER_PRESSURE_MPA = 0.3;

// Liquid properties are tabulated once at 0.1 K steps over 0–100 °C and interpolated
// linearly: the hot paths (fleet state of charge, V40) then cost a lookup, not 34 powers.
const STEP_K = 0.1;
const STEPS = Math.round(100 / STEP_K);
const DENSITY = new Float64Array(STEPS + 1);
const ENTHALPY = new Float64Array(STEPS + 1); // J/kg, relative to 0 °C
const CP = new Float64Array(STEPS + 1); // J/(kg·K)
{
  const h0 = if97Region1(273.15, CYLINDER_PRESSURE_MPA).enthalpyKJPerKg;
  for (let i = 0; i <= STEPS; i++) {
    const r = if97Region1(273.15 + i * STEP_K, CYLINDER_PRESSURE_MPA);
    DENSITY[i] = r.densityKgPerM3;
    ENTHALPY[i] = (r.enthalpyKJPerKg - h0) * 1000;
    CP[i] = r.cpKJPerKgK * 1000;
  }
}

function lookup(table: Float64Array, tempC: number): number {
  const x = tempC / STEP_K;
  const i = Math.min(STEPS - 1, Math.max(0, Math.floor(x)));
  const f = x - i;
  return table[i]! + (table[i + 1]! - table[i]!) * f;
}

/** Density of liquid water at `tempC` (°C, 0–100) and the cylinder pressure, kg/m³ (= kg per 1000 L). */
export function waterDensity(tempC: number): number {
  return lookup(DENSITY, waterTemp('tempC', tempC));
}

/** Specific isobaric heat capacity of liquid water at `tempC` (°C, 0–100), J/(kg·K). */
export function waterCp(tempC: number): number {
  return lookup(CP, waterTemp('tempC', tempC));
}

/** Specific enthalpy of liquid water at `tempC` (°C, 0–100) relative to water at 0 °C, J/kg. */
export function waterEnthalpy(tempC: number): number {
  return lookup(ENTHALPY, waterTemp('tempC', tempC));
}

/** Unchecked table lookups for callers that validated their input already (same units as above). */
export const unchecked = {
  density: (tempC: number): number => lookup(DENSITY, tempC),
  enthalpy: (tempC: number): number => lookup(ENTHALPY, tempC),
};
