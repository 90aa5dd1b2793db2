import { describe, expect, it } from 'vitest';
import { tappingProfile, TAPPING_QREF_KWH } from '../../../src/lib/thermal/index.js';
import type { TappingProfileSize } from '../../../src/lib/thermal/index.js';

const SIZES: TappingProfileSize[] = ['XS', 'S', 'M', 'L', 'XL', 'XXL'];

describe('tappingProfile', () => {
  it('has the reference energies of Regulation (EU) No 814/2013', () => {
    // 814/2013 Annex III / EN 16147: Qref XS 2.1, S 2.1, M 5.845, L 11.655, XL 19.07, XXL 24.53 kWh.
    expect(TAPPING_QREF_KWH).toEqual({ XS: 2.1, S: 2.1, M: 5.845, L: 11.655, XL: 19.07, XXL: 24.53 });
  });

  for (const size of SIZES) {
    it(`draws of ${size} add up to its Qref, in time order`, () => {
      // The draws of each cycle sum to Qref (814/2013 Annex III; rows of XS, S, XL, XXL from memory).
      const p = tappingProfile(size);
      const sum = p.draws.reduce((a, d) => a + d.energyKWh, 0);
      expect(sum).toBeCloseTo(p.qrefKWh, 9);
      for (let i = 1; i < p.draws.length; i++)
        expect(p.draws[i]!.minuteOfDay).toBeGreaterThan(p.draws[i - 1]!.minuteOfDay);
    });
  }

  it('describes the M cycle draw by draw', () => {
    // 814/2013 Annex III, profile M (from memory): 23 draws, two 1.4 kWh showers at 07:05 and 21:30, dishwashing 0.315 and 0.735 kWh.
    const m = tappingProfile('M');
    expect(m.draws).toHaveLength(23);
    expect(m.draws.filter((d) => d.tap === 'shower').map((d) => [d.time, d.energyKWh])).toEqual([
      ['07:05', 1.4],
      ['21:30', 1.4],
    ]);
    expect(m.draws.filter((d) => d.tap === 'dishwashing').map((d) => d.energyKWh)).toEqual([0.315, 0.735]);
    // Small draws Tm 25 °C; shower and household cleaning Tm 40 °C; floor cleaning Tp 40 °C; dishwashing Tp 55 °C (814/2013 Annex III).
    const byTap = new Map(m.draws.map((d) => [d.tap, d]));
    expect(byTap.get('small')!.usefulC).toBe(25);
    expect(byTap.get('shower')!.usefulC).toBe(40);
    expect(byTap.get('household_cleaning')!.usefulC).toBe(40);
    expect(byTap.get('floor_cleaning')!.peakC).toBe(40);
    expect(byTap.get('dishwashing')!.peakC).toBe(55);
  });

  it('has two baths of 3.605 kWh in the L cycle', () => {
    // 814/2013 Annex III, profile L (from memory): baths at 08:05 and 21:00, Tp 40 °C.
    const baths = tappingProfile('L').draws.filter((d) => d.tap === 'bath');
    expect(baths.map((d) => [d.time, d.energyKWh, d.peakC])).toEqual([
      ['08:05', 3.605, 40],
      ['21:00', 3.605, 40],
    ]);
  });

  it('returns a fresh copy on every call', () => {
    const a = tappingProfile('M');
    a.draws[0]!.energyKWh = 99;
    expect(tappingProfile('M').draws[0]!.energyKWh).toBe(0.105);
  });

  it('refuses an unknown size', () => {
    expect(() => tappingProfile('XXS' as TappingProfileSize)).toThrow(
      /size is XXS: it must be one of XS, S, M, L, XL, XXL/,
    );
  });
});
