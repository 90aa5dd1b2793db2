// Units of the energy core, fixed once: energy kWh, power W, prices pence per kWh (p/kWh),
// money pence, volumes litres, times epoch milliseconds (UTC), temperatures °C.
import { EN16147_COLD_C, EN16147_DELIVERY_C, MODEL_PROPERTY_C, waterCp, waterDensity } from '../thermal/index.js';

/** Milliseconds in one half-hour settlement slot. */
export const HALF_HOUR_MS = 30 * 60 * 1000;
/** Pence in one pound sterling. */
export const PENCE_PER_POUND = 100;
/** Joules in one kWh. */
export const J_PER_KWH = 3.6e6;
/** Delivery temperature of V40, °C (EN 16147). */
export const V40_DELIVERY_C = EN16147_DELIVERY_C;
/** Cold water when a home has none of its own, °C (EN 16147; the thermal core's one definition). */
export const DEFAULT_COLD_C = EN16147_COLD_C;

/**
 * Heat above cold water in one litre of mixed water at 40 °C, kWh/L, with the water properties the
 * tank model uses (IAPWS-IF97 at {@link MODEL_PROPERTY_C} °C) so that planner and model agree.
 */
export function kWhPerLitreAt40(coldC: number): number {
  return ((waterDensity(MODEL_PROPERTY_C) / 1000) * waterCp(MODEL_PROPERTY_C) * (V40_DELIVERY_C - coldC)) / J_PER_KWH;
}
