import { interpolateCividis } from 'd3-scale-chromatic';

/**
 * Temperature as colour on cividis (Nuñez, Anderton & Renslow 2018, PLOS ONE 13(7): e0199239),
 * a perceptually uniform scale designed to read the same for people with colour-vision deficiency.
 * Dark blue is cold mains water, yellow the hottest stored water.
 */
export const TEMP_SCALE_MIN_C = 10;
export const TEMP_SCALE_MAX_C = 70;

export function temperatureColour(tempC: number, minC = TEMP_SCALE_MIN_C, maxC = TEMP_SCALE_MAX_C): string {
  if (!Number.isFinite(tempC)) return '#9aa3a8';
  const f = Math.min(1, Math.max(0, (tempC - minC) / (maxC - minC)));
  return interpolateCividis(f);
}
