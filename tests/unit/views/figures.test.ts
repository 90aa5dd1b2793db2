import { describe, expect, it } from 'vitest';
import { columnFigures, layerThicknesses, layersFromCc } from '../../../src/lib/views/layers';
import { defaultAssumptions, everydayEquivalents, litresAt40ForEnergy } from '../../../src/lib/views/everyday';
import { refillEstimate } from '../../../src/lib/views/refill';

const tank = { volumeL: 200, heightM: 1.4, targetC: 55 };

describe('column figures', () => {
  it('gives V40 = V·(T − 10)/(40 − 10) for a uniformly hot tank', () => {
    // EN 16147 V40 with cold water at 10 °C: 200 L at 55 °C → 200 · 45/30 = 300 L.
    const f = columnFigures(Array(12).fill(55), tank)!;
    expect(f.v40L).toBeCloseTo(300, 6);
    expect(f.soc).toBeCloseTo(1, 9);
  });
  it('counts only the layers from the top down that are at 40 °C or more', () => {
    // Top half at 60 °C, bottom half at 15 °C: 100 L · (60 − 10)/30 = 166.7 L (EN 16147 definition).
    const f = columnFigures([15, 15, 15, 15, 60, 60, 60, 60], tank)!;
    expect(f.v40L).toBeCloseTo(166.667, 2);
    // State of charge: mean of (T − 10)/(55 − 10) clamped: (4 · 5/45 + 4 · 1)/8 = 0.5556.
    expect(f.soc).toBeCloseTo((4 * (5 / 45) + 4) / 8, 6);
  });
  it('estimates a missing sensor by height and says so; withholds without the top sensor', () => {
    // Evenly spaced sensors: the middle one is half-way, so its layer is the mean of its neighbours (linear by height, common practice).
    const f = columnFigures([50, null, 56], tank)!;
    expect(f.layersC).toEqual([50, 53, 56]);
    expect(f.quality).toMatchObject({
      status: 'estimated',
      leftOut: [2],
      reason: 'Estimated, sensor 2 left out (no reading).',
    });
    const top = columnFigures([50, 53, null], tank)!;
    expect([top.v40L, top.soc, top.quality.status]).toEqual([null, null, 'withheld']);
    expect(columnFigures([], tank)).toBeNull();
    expect(layersFromCc([5000, null, 5525])).toEqual([50, null, 55.25]);
  });
  it('turns sensor positions into the layer each sensor stands for', () => {
    for (const [i, h] of layerThicknesses([0.1, 0.5, 0.9], 1)!.entries())
      expect(h).toBeCloseTo([0.3, 0.4, 0.3][i]!, 12);
    expect(layerThicknesses(null, 1)).toBeUndefined();
  });
});

describe('everyday equivalents', () => {
  it('sizes a shower and a bath from the EN 16147 draws (1.4 kWh and 3.605 kWh at 40 °C from 10 °C)', () => {
    // ρ = 992.2 kg/m³ and cp = 4.179 kJ/(kg·K) at 40 °C (IAPWS-IF97 / handbook): 1 L over 30 K = 124.4 kJ.
    // Shower 1.4 kWh = 5040 kJ → 40.5 L; bath 3.605 kWh = 12978 kJ → 104.3 L.
    expect(litresAt40ForEnergy(1.4)).toBeCloseTo(5040 / (0.9922 * 4.179 * 30), 0);
    expect(defaultAssumptions()).toEqual({ showerL: 41, bathL: 104 });
  });
  it('counts whole showers and baths only', () => {
    expect(everydayEquivalents(130, { showerL: 41, bathL: 104 })).toEqual({ showers: 3, baths: 1 });
    expect(everydayEquivalents(40, { showerL: 41, bathL: 104 })).toEqual({ showers: 0, baths: 0 });
    expect(everydayEquivalents(82, { showerL: 41, bathL: 104 })).toEqual({ showers: 2, baths: 0 });
  });
});

describe('time to full', () => {
  it('needs the heat to raise the whole tank from cold to the target', () => {
    // 200 L from 10 to 55 °C: about 197 kg (ρ(55 °C) ≈ 985.7 kg/m³) × 188.3 kJ/kg (h(55) − h(10), IAPWS-IF97) ≈ 10.3 kWh.
    const kWh = columnFigures(Array(10).fill(10), tank)!.toFullKWh!;
    expect(kWh).toBeGreaterThan(10.2);
    expect(kWh).toBeLessThan(10.4);
    expect(columnFigures(Array(10).fill(55), tank)!.toFullKWh).toBeCloseTo(0, 9);
  });
  it('divides the missing heat by the running heat source output', () => {
    const r = refillEstimate({
      toFullKWh: 10,
      hpOutputW: 5000,
      immersionRatingW: 3000,
      compressorOn: true,
      immersionW: 0,
      now: 0,
    });
    expect(r).toEqual({ state: 'heating', hours: 2, source: 'heat_pump', readyAt: 2 * 3_600_000 });
    const i = refillEstimate({
      toFullKWh: 6,
      hpOutputW: 0,
      immersionRatingW: 3000,
      compressorOn: false,
      immersionW: 3000,
      now: 0,
    });
    expect(i.source).toBe('immersion');
    expect(i.hours).toBe(2);
    expect(
      refillEstimate({
        toFullKWh: 0.05,
        hpOutputW: 5000,
        immersionRatingW: 3000,
        compressorOn: false,
        immersionW: 0,
        now: 0,
      }).state,
    ).toBe('full');
    expect(
      refillEstimate({
        toFullKWh: null,
        hpOutputW: 5000,
        immersionRatingW: 3000,
        compressorOn: false,
        immersionW: 0,
        now: 0,
      }).state,
    ).toBe('unknown');
  });
});
