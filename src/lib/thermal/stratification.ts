// How well a tank is stratified: the MIX number and the thermocline.
import { ThermalInputError } from './errors.js';
import { layerHeights, layers, positive, record } from './validate.js';
import type { LayerProfile } from './energy.js';

/**
 * MIX number of Davidson, Adams & Miller (1994), J. Solar Energy Eng. 116: 0 for a perfectly
 * stratified tank of the same energy, 1 for a fully mixed one. Uses the energy moment Σ y·E about
 * the tank bottom (constant water properties, so E ∝ T·Δy), each layer's moment at its centre:
 *   MIX = (M_stratified − M_actual) / (M_stratified − M_mixed)
 * where M_stratified is a hot zone at the profile's maximum above a cold zone at its minimum
 * holding the same energy, and M_mixed the whole tank at the mean temperature. A profile with
 * no spread (uniform) is fully mixed: 1. An inverted profile, whose moment falls below the
 * mixed one, is unstable and reported as 1; results are clamped to [0, 1].
 * `heightsM`: optional thickness of each layer, metres (default equal layers).
 */
export function mixNumber(input: LayerProfile): number {
  record('input', input, '{ layersC, heightsM? }');
  const t = layers('layersC', input.layersC);
  const h = layerHeights('heightsM', input.heightsM, t.length);
  let height = 0;
  let energy = 0; // ∫T dy
  let moment = 0; // ∫y·T dy
  let tMin = Infinity;
  let tMax = -Infinity;
  for (let i = 0; i < t.length; i++) {
    const ti = t[i]!;
    const dy = h[i]!;
    energy += ti * dy;
    moment += (height + dy / 2) * ti * dy;
    height += dy;
    if (ti < tMin) tMin = ti;
    if (ti > tMax) tMax = ti;
  }
  if (tMax - tMin < 1e-9) return 1;
  const mean = energy / height;
  const mixed = (mean * height * height) / 2;
  // Interface height y* of the ideal two-zone profile with the same energy.
  const yStar = (tMax * height - energy) / (tMax - tMin);
  const stratified = (tMin * yStar * yStar) / 2 + (tMax * (height * height - yStar * yStar)) / 2;
  const denominator = stratified - mixed;
  if (denominator <= 0) return 1;
  const mix = (stratified - moment) / denominator;
  return Math.min(1, Math.max(0, mix));
}

/** Where the transition from cold to hot water sits. Heights from the tank bottom, metres. */
export interface Thermocline {
  /** Height where the dimensionless temperature θ = (T − Tmin)/(Tmax − Tmin) first reaches 0.5. */ heightM: number;
  /** Distance between the first heights where θ reaches 0.1 and 0.9. */ thicknessM: number;
  /** Height where θ first reaches 0.1. */ bottomM: number;
  /** Height where θ first reaches 0.9. */ topM: number;
  /** Total column height used, metres. */ tankHeightM: number;
}

/**
 * Height and thickness of the transition zone. The profile is normalised to
 * θ = (T − Tmin)/(Tmax − Tmin) and interpolated linearly between layer centres (held flat beyond
 * the end centres); the zone runs from the first height where θ reaches 0.1 to the first where it
 * reaches 0.9, and its height is where θ reaches 0.5 (10 %/90 % limits: common practice).
 * Returns null when the spread Tmax − Tmin is below `minSpreadK` (default 2 K): no transition to
 * speak of. `heightsM` gives each layer's thickness in metres; without it the column is split into
 * equal layers of a column `tankHeightM` tall (default 1, so heights are then fractions of the height).
 */
export function thermocline(input: LayerProfile & { tankHeightM?: number; minSpreadK?: number }): Thermocline | null {
  record('input', input, '{ layersC, heightsM?, tankHeightM? }');
  const t = layers('layersC', input.layersC);
  const total = input.tankHeightM === undefined ? 1 : positive('tankHeightM', input.tankHeightM, 'metres');
  const minSpread = input.minSpreadK === undefined ? 2 : positive('minSpreadK', input.minSpreadK, 'kelvin');
  if (input.heightsM !== undefined && input.tankHeightM !== undefined) {
    throw new ThermalInputError(
      'tankHeightM',
      'tankHeightM and heightsM were both given: pass layer thicknesses (heightsM) or a column height (tankHeightM), not both.',
    );
  }
  const h = layerHeights('heightsM', input.heightsM, t.length, total);
  let tMin = Infinity;
  let tMax = -Infinity;
  for (const x of t) {
    if (x < tMin) tMin = x;
    if (x > tMax) tMax = x;
  }
  if (tMax - tMin < minSpread) return null;
  const centres: number[] = [];
  let y = 0;
  for (const dy of h) {
    centres.push(y + dy / 2);
    y += dy;
  }
  const theta = t.map((x) => (x - tMin) / (tMax - tMin));
  const firstReach = (level: number): number => {
    if (theta[0]! >= level) return centres[0]!;
    for (let i = 1; i < theta.length; i++) {
      const a = theta[i - 1]!;
      const b = theta[i]!;
      if (b >= level) return centres[i - 1]! + ((level - a) / (b - a)) * (centres[i]! - centres[i - 1]!);
    }
    return centres[centres.length - 1]!; // unreachable: θ reaches 1 somewhere
  };
  const bottomM = firstReach(0.1);
  const topM = Math.max(bottomM, firstReach(0.9));
  return { heightM: firstReach(0.5), thicknessM: topM - bottomM, bottomM, topM, tankHeightM: y };
}
