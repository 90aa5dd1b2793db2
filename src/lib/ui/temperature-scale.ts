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
  return cividis(f);
}

/**
 * Cividis as d3-scale-chromatic 3.1 approximates it (a polynomial per channel, ISC licence); the
 * package itself builds every one of its schemes when loaded (11 kB of gzipped script), so the
 * polynomial is kept here and a unit test checks it against the package.
 */
export function cividis(t: number): string {
  const x = Math.max(0, Math.min(1, t));
  const channel = (v: number) => Math.max(0, Math.min(255, Math.round(v)));
  const r = channel(-4.54 - x * (35.34 - x * (2381.73 - x * (6402.7 - x * (7024.72 - x * 2710.57)))));
  const g = channel(32.49 + x * (170.73 + x * (52.82 - x * (131.46 - x * (176.58 - x * 67.37)))));
  const b = channel(81.24 + x * (442.36 - x * (2482.43 - x * (6167.24 - x * (6614.94 - x * 2475.67)))));
  return `rgb(${r}, ${g}, ${b})`;
}
