import { describe, expect, it } from 'vitest';
import { compressorCycles, shortCycleViolations } from '../../../src/lib/thermal/index.js';

const MIN = 60_000;
const t0 = Date.UTC(2025, 2, 1, 6);
const at = (m: number, on: boolean) => ({ t: t0 + m * MIN, on });

describe('compressorCycles', () => {
  it('finds starts and runs', () => {
    const r = compressorCycles([
      at(0, false),
      at(10, true),
      at(50, false),
      at(70, true),
      at(80, false),
      at(200, true),
      at(230, true),
    ]);
    expect(r.starts).toEqual([t0 + 10 * MIN, t0 + 70 * MIN, t0 + 200 * MIN]);
    expect(r.runs.map((x) => [x.minutes, x.complete])).toEqual([
      [40, true],
      [10, true],
      [30, false],
    ]);
  });

  it('does not count a run already going at the first sample as a start', () => {
    const r = compressorCycles([at(0, true), at(20, false)]);
    expect(r.starts).toEqual([]);
    expect(r.runs).toHaveLength(1);
    expect(r.runs[0]!.complete).toBe(false);
  });

  it('refuses unordered samples and non-boolean states', () => {
    expect(() => compressorCycles([at(10, false), at(5, true)])).toThrow(/samples\[1\].t is not after samples\[0\].t/);
    expect(() => compressorCycles([{ t: t0, on: 1 as unknown as boolean }])).toThrow(/samples\[0\].on is 1/);
  });
});

describe('shortCycleViolations', () => {
  it('flags starts within the minimum gap of the previous start', () => {
    // At most one hot-water compressor start per hour: minGapMin 60 (common practice).
    const starts = [0, 30, 95, 155, 170].map((m) => t0 + m * MIN);
    expect(shortCycleViolations(starts, { minGapMin: 60 })).toEqual([t0 + 30 * MIN, t0 + 170 * MIN]);
  });

  it('is configurable per company and accepts runs', () => {
    const { runs, starts } = compressorCycles([at(0, false), at(1, true), at(5, false), at(40, true), at(45, false)]);
    expect(shortCycleViolations(starts, { minGapMin: 30 })).toEqual([]);
    expect(shortCycleViolations(starts, { minGapMin: 40 })).toEqual([t0 + 40 * MIN]);
    expect(shortCycleViolations(runs, { minGapMin: 60 })).toEqual([runs[1]]);
  });

  it('refuses a missing gap and unordered starts', () => {
    expect(() => shortCycleViolations([t0], { minGapMin: Number.NaN })).toThrow(/minGapMin is NaN/);
    expect(() => shortCycleViolations([t0 + MIN, t0], { minGapMin: 60 })).toThrow(/starts\[1\] is before starts\[0\]/);
  });
});
