// Energy-efficiency class of a hot-water storage tank from its standing loss.
import { nonNegative, positive, record } from './validate.js';

/** Storage-tank energy classes, best first. */
export type ErpClass = 'A+' | 'A' | 'B' | 'C' | 'D' | 'E' | 'F' | 'G';

// Commission Delegated Regulation (EU) No 812/2013, Annex II, table for hot-water storage tanks:
// class applies when S < k0 + k1·V^0.4 (S in W, V in litres). Coefficients from memory.
const LIMITS: ReadonlyArray<readonly [ErpClass, number, number]> = [
  ['A+', 5.5, 3.16],
  ['A', 8.5, 4.25],
  ['B', 12, 5.93],
  ['C', 16.66, 8.33],
  ['D', 21, 10.33],
  ['E', 26, 13.66],
  ['F', 31, 16.66],
];

/** Upper limit of standing loss for `cls` at volume `volumeL` (L), W; Infinity for G. */
export function erpClassLimitW(cls: ErpClass, volumeL: number): number {
  const v = positive('volumeL', volumeL, 'litres');
  const row = LIMITS.find(([c]) => c === cls);
  return row ? row[1] + row[2] * v ** 0.4 : Infinity;
}

/**
 * Storage-tank energy class for a tank of `volumeL` litres with standing loss `standingLossW` (W):
 * the first class whose limit k0 + k1·V^0.4 the loss is strictly below, else G.
 */
export function erpClass(input: { volumeL: number; standingLossW: number }): ErpClass {
  record('input', input, '{ volumeL, standingLossW }');
  const v = positive('volumeL', input.volumeL, 'litres');
  const s = nonNegative('standingLossW', input.standingLossW, 'W');
  const p = v ** 0.4;
  for (const [cls, k0, k1] of LIMITS) if (s < k0 + k1 * p) return cls;
  return 'G';
}
