import { describe, expect, it } from 'vitest';
import { erpClass, erpClassLimitW } from '../../../src/lib/thermal/index.js';

// Commission Delegated Regulation (EU) No 812/2013, Annex II, storage tanks: class when S < k0 + k1·V^0.4
// (coefficients from memory: A+ 5.5/3.16, A 8.5/4.25, B 12/5.93, C 16.66/8.33, D 21/10.33, E 26/13.66, F 31/16.66).
describe('erpClass', () => {
  const v = 200;
  const p = v ** 0.4;

  it('places standing losses of a 200 L tank in their classes', () => {
    expect(erpClass({ volumeL: v, standingLossW: 30 })).toBe('A+'); // limit 5.5 + 3.16·8.33 ≈ 31.8 W
    expect(erpClass({ volumeL: v, standingLossW: 40 })).toBe('A'); // limit ≈ 43.9 W
    expect(erpClass({ volumeL: v, standingLossW: 55 })).toBe('B'); // limit ≈ 61.4 W
    expect(erpClass({ volumeL: v, standingLossW: 80 })).toBe('C');
    expect(erpClass({ volumeL: v, standingLossW: 100 })).toBe('D');
    expect(erpClass({ volumeL: v, standingLossW: 130 })).toBe('E');
    expect(erpClass({ volumeL: v, standingLossW: 160 })).toBe('F');
    expect(erpClass({ volumeL: v, standingLossW: 200 })).toBe('G');
  });

  it('uses a strict "less than" at each limit', () => {
    const a = 8.5 + 4.25 * p;
    expect(erpClassLimitW('A', v)).toBeCloseTo(a, 12);
    expect(erpClass({ volumeL: v, standingLossW: a - 1e-9 })).toBe('A');
    expect(erpClass({ volumeL: v, standingLossW: a })).toBe('B');
    expect(erpClassLimitW('G', v)).toBe(Infinity);
  });

  it('refuses a negative volume or loss', () => {
    expect(() => erpClass({ volumeL: -200, standingLossW: 40 })).toThrow(/volumeL is -200/);
    expect(() => erpClass({ volumeL: 200, standingLossW: -1 })).toThrow(/standingLossW is -1/);
  });
});
