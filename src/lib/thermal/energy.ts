// How much heat, and how much usable hot water, a column of layer temperatures holds.
import { ThermalInputError } from './errors.js';
import { layerHeights, layers, positive, record, waterTemp } from './validate.js';
import { unchecked } from './water.js';

/** Options shared by the layer-profile functions. */
export interface LayerProfile {
  /** Layer temperatures, °C, bottom to top (one per sensor). */
  layersC: readonly number[];
  /** Optional thickness of each layer, metres; layers share the volume in proportion. Default: equal shares. */
  heightsM?: readonly number[];
}

function shares(field: string, heightsM: readonly number[] | undefined, count: number): number[] {
  const h = layerHeights(field, heightsM, count);
  let total = 0;
  for (const x of h) total += x;
  return h.map((x) => x / total);
}

/**
 * Heat held above `refC`, kWh: Σ V_i·ρ(T_i)·(h(T_i) − h(refC)) over the layers warmer than `refC`
 * (layers at or below it add nothing). `volumeL` is the stored volume in litres; ρ and h are
 * IAPWS-IF97 region 1 values at the cylinder pressure.
 */
export function storedEnergyKWh(input: LayerProfile & { volumeL: number; refC: number }): number {
  record('input', input, '{ layersC, volumeL, refC }');
  const t = layers('layersC', input.layersC);
  const volumeL = positive('volumeL', input.volumeL, 'litres');
  const refC = waterTemp('refC', input.refC);
  const w = input.heightsM === undefined ? null : shares('heightsM', input.heightsM, t.length);
  const hRef = unchecked.enthalpy(refC);
  let joules = 0;
  for (let i = 0; i < t.length; i++) {
    const ti = t[i]!;
    if (ti <= refC) continue;
    const m3 = (volumeL / 1000) * (w ? w[i]! : 1 / t.length);
    joules += m3 * unchecked.density(ti) * (unchecked.enthalpy(ti) - hRef);
  }
  return joules / 3.6e6;
}

/**
 * Litres of water at `deliveryC` (°C) the tank can deliver when drawn from the top by plug flow
 * and mixed with cold water at `coldC` (°C): counting layers from the top down while they are at
 * or above `deliveryC`, each layer of volume V_i at T_i yields V_i·(T_i − cold)/(delivery − cold).
 * With deliveryC 40 and coldC 10 this is the V40 of EN 16147. `volumeL` in litres.
 */
export function mixedWaterLitres(input: LayerProfile & { volumeL: number; coldC: number; deliveryC: number }): number {
  record('input', input, '{ layersC, volumeL, coldC, deliveryC }');
  const t = layers('layersC', input.layersC);
  const volumeL = positive('volumeL', input.volumeL, 'litres');
  const coldC = waterTemp('coldC', input.coldC);
  const deliveryC = waterTemp('deliveryC', input.deliveryC);
  if (deliveryC <= coldC) {
    throw new ThermalInputError(
      'deliveryC',
      `deliveryC is ${deliveryC} °C: the delivery temperature must be above the cold-water temperature (${coldC} °C).`,
    );
  }
  const w = input.heightsM === undefined ? null : shares('heightsM', input.heightsM, t.length);
  const span = deliveryC - coldC;
  let litres = 0;
  for (let i = t.length - 1; i >= 0; i--) {
    const ti = t[i]!;
    if (ti < deliveryC) break;
    litres += volumeL * (w ? w[i]! : 1 / t.length) * ((ti - coldC) / span);
  }
  return litres;
}

/**
 * State of charge, 0–1: the mean over layers (volume-weighted when `heightsM` is given) of
 * (T − coldC)/(targetC − coldC), each clamped to [0, 1]. Temperatures in °C.
 */
export function stateOfCharge(input: LayerProfile & { coldC: number; targetC: number }): number {
  record('input', input, '{ layersC, coldC, targetC }');
  const t = layers('layersC', input.layersC);
  const coldC = waterTemp('coldC', input.coldC);
  const targetC = waterTemp('targetC', input.targetC);
  if (targetC <= coldC) {
    throw new ThermalInputError(
      'targetC',
      `targetC is ${targetC} °C: the target temperature must be above the cold-water temperature (${coldC} °C).`,
    );
  }
  const w = input.heightsM === undefined ? null : shares('heightsM', input.heightsM, t.length);
  const span = targetC - coldC;
  let soc = 0;
  for (let i = 0; i < t.length; i++) {
    const x = (t[i]! - coldC) / span;
    soc += (x <= 0 ? 0 : Math.min(x, 1)) * (w ? w[i]! : 1 / t.length);
  }
  return Math.min(1, Math.max(0, soc));
}
