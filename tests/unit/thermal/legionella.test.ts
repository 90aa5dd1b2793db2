import { describe, expect, it } from 'vitest';
import { legionellaExposure } from '../../../src/lib/thermal/index.js';

const MIN = 60_000;
const t0 = Date.UTC(2025, 5, 1, 2);

/** One reading a minute for `minutes`, layer i at temps(i, minute). */
function series(minutes: number, temps: (layer: number, m: number) => number, layers = 4) {
  return Array.from({ length: minutes + 1 }, (_, m) => ({
    t: t0 + m * MIN,
    layersC: Array.from({ length: layers }, (_, i) => temps(i, m)),
  }));
}

// HSE HSG274 Part 2 (2014): store hot water at 60 °C or above; the checks use thresholdC 60.
describe('legionellaExposure', () => {
  it('counts minutes at or above the threshold per layer', () => {
    // Top two layers at 61 °C for 90 minutes, bottom two at 45 °C.
    const r = legionellaExposure(
      series(90, (i) => (i >= 2 ? 61 : 45)),
      { thresholdC: 60, holdMin: 60 },
    );
    expect(r.minutesAtOrAbove).toEqual([0, 0, 90, 90]);
    expect(r.layerHeld).toEqual([false, false, true, true]);
    expect(r.heldFraction).toBeCloseTo(0.5, 12);
  });

  it('needs one unbroken stretch to count as held', () => {
    // 40 min hot, 5 min dip, 40 min hot: 80 min in total but no stretch of 60.
    const r = legionellaExposure(
      series(85, (_, m) => (m > 40 && m < 45 ? 58 : 62), 1),
      { thresholdC: 60, holdMin: 60 },
    );
    expect(r.minutesAtOrAbove[0]).toBeCloseTo(80, 9);
    expect(r.longestStretchMin[0]).toBeCloseTo(40, 9);
    expect(r.heldFraction).toBe(0);
  });

  it('does not count a gap in telemetry as time at temperature', () => {
    const s = [
      { t: t0, layersC: [62] },
      { t: t0 + 60 * MIN, layersC: [62] },
    ];
    expect(legionellaExposure(s, { thresholdC: 60, holdMin: 30 }).minutesAtOrAbove).toEqual([0]);
    expect(legionellaExposure(s, { thresholdC: 60, holdMin: 30, maxGapMin: 60 }).minutesAtOrAbove).toEqual([60]);
  });

  it('weights the held fraction by layer height', () => {
    const r = legionellaExposure(
      series(70, (i) => (i === 1 ? 61 : 50), 2),
      { thresholdC: 60, holdMin: 60, heightsM: [0.9, 0.3] },
    );
    expect(r.heldFraction).toBeCloseTo(0.25, 12);
  });

  it('refuses unordered readings and changing layer counts', () => {
    const s = series(3, () => 61);
    expect(() => legionellaExposure([s[1]!, s[0]!], { thresholdC: 60, holdMin: 60 })).toThrow(
      /series\[1\].t is not after series\[0\].t/,
    );
    expect(() => legionellaExposure([s[0]!, { t: s[1]!.t, layersC: [61] }], { thresholdC: 60, holdMin: 60 })).toThrow(
      /same 4 layers/,
    );
    expect(() => legionellaExposure([], { thresholdC: 60, holdMin: 60 })).toThrow(/series is empty/);
    expect(() => legionellaExposure(s, { thresholdC: 60, holdMin: 0 })).toThrow(/holdMin is 0/);
  });
});
