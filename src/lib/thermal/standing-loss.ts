// Standing heat loss of a cylinder from a cooling period (no draw, no heating), by Newton's law
// of cooling: T(t) = T_amb + (T0 − T_amb)·e^(−t·UA/(m·c)).
import { ThermalInputError } from './errors.js';
import { finite, positive, record, waterTemp } from './validate.js';
import { waterCp, waterDensity } from './water.js';

/** One reading during the cooling period: epoch milliseconds and the volume-mean water temperature, °C. */
export interface CoolingSample {
  t: number;
  meanC: number;
}

/** Result of the cooling-curve fit. */
export interface StandingLossResult {
  /** Loss coefficient, W/K. */ uaWPerK: number;
  /** Heat loss at 45 K above ambient, W (the ErP standing loss S is measured near this). */ lossWAt45K: number;
  /** The same loss over 24 h, kWh. */ kWhPer24hAt45K: number;
  /** Cooling time constant m·c/UA, hours. */ timeConstantH: number;
  /** Root-mean-square difference between the samples and the fitted curve, K. */ rmsResidualK: number;
}

/**
 * Fit Newton's law of cooling to `samples` (strictly increasing `t`) taken while nothing was drawn
 * or heated. `volumeL` litres, `ambientC` °C. Rejects, with a ThermalInputError, a period shorter
 * than `minHours` (default 4), samples fewer than 3 or closer than `minExcessK` (default 3 K) to
 * ambient, a temperature that does not fall, and a fit whose RMS residual exceeds `maxRmsK` (default 0.3 K).
 * Water mass and heat capacity are IAPWS-IF97 values at the period's mean temperature.
 */
export function standingLoss(
  samples: readonly CoolingSample[],
  options: { volumeL: number; ambientC: number; minHours?: number; minExcessK?: number; maxRmsK?: number },
): StandingLossResult {
  record('options', options, '{ volumeL, ambientC }');
  const volumeL = positive('volumeL', options.volumeL, 'litres');
  const ambientC = finite('ambientC', options.ambientC, 'a temperature in °C');
  const minHours = options.minHours === undefined ? 4 : positive('minHours', options.minHours, 'hours');
  const minExcessK = options.minExcessK === undefined ? 3 : positive('minExcessK', options.minExcessK, 'kelvin');
  const maxRmsK = options.maxRmsK === undefined ? 0.3 : positive('maxRmsK', options.maxRmsK, 'kelvin');
  if (!Array.isArray(samples) || samples.length < 3) {
    throw new ThermalInputError(
      'samples',
      `samples holds ${Array.isArray(samples) ? samples.length : 'no'} readings: at least 3 readings over the cooling period are needed.`,
    );
  }
  const xs: number[] = [];
  const ys: number[] = [];
  let sumT = 0;
  for (let i = 0; i < samples.length; i++) {
    const s = samples[i]!;
    const t = finite(`samples[${i}].t`, s?.t, 'a time in epoch milliseconds');
    const c = waterTemp(`samples[${i}].meanC`, s?.meanC);
    if (i > 0 && t <= samples[i - 1]!.t) {
      throw new ThermalInputError(
        `samples[${i}].t`,
        `samples[${i}].t is not after samples[${i - 1}].t: samples must be in strictly increasing time order.`,
      );
    }
    if (c - ambientC < minExcessK) {
      throw new ThermalInputError(
        `samples[${i}].meanC`,
        `samples[${i}].meanC is ${c} °C, within ${minExcessK} K of ambient (${ambientC} °C): the fit needs water clearly warmer than its surroundings.`,
      );
    }
    xs.push((t - samples[0]!.t) / 1000);
    ys.push(Math.log(c - ambientC));
    sumT += c;
  }
  const durationH = xs[xs.length - 1]! / 3600;
  if (durationH < minHours) {
    throw new ThermalInputError(
      'samples',
      `samples span ${durationH.toFixed(2)} h: a cooling period of at least ${minHours} h is needed for a reliable fit.`,
    );
  }
  const n = xs.length;
  const mx = xs.reduce((a, b) => a + b, 0) / n;
  const my = ys.reduce((a, b) => a + b, 0) / n;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < n; i++) {
    sxx += (xs[i]! - mx) ** 2;
    sxy += (xs[i]! - mx) * (ys[i]! - my);
  }
  const slope = sxy / sxx; // −UA/(m·c), 1/s
  if (!(slope < 0)) {
    throw new ThermalInputError(
      'samples',
      'samples do not cool over the period: pick a period with no heating and no draw.',
    );
  }
  const intercept = my - slope * mx;
  let sq = 0;
  for (let i = 0; i < n; i++) {
    const fitted = ambientC + Math.exp(intercept + slope * xs[i]!);
    sq += (fitted - (ambientC + Math.exp(ys[i]!))) ** 2;
  }
  const rms = Math.sqrt(sq / n);
  if (rms > maxRmsK) {
    throw new ThermalInputError(
      'samples',
      `samples are too noisy for a cooling curve (RMS residual ${rms.toFixed(2)} K, limit ${maxRmsK} K): the period probably includes a draw or heating.`,
    );
  }
  const meanC = sumT / n;
  const heatCapacityJPerK = (volumeL / 1000) * waterDensity(meanC) * waterCp(meanC);
  const ua = -slope * heatCapacityJPerK;
  return {
    uaWPerK: ua,
    lossWAt45K: ua * 45,
    kWhPer24hAt45K: (ua * 45 * 24) / 1000,
    timeConstantH: heatCapacityJPerK / ua / 3600,
    rmsResidualK: rms,
  };
}
