import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  mixedWaterLitres,
  stateOfCharge,
  storedEnergyKWh,
  ThermalInputError,
  waterCp,
  waterDensity,
} from '../../../src/lib/thermal/index.js';

const layerArb = fc.array(fc.double({ min: 0, max: 100, noNaN: true }), { minLength: 1, maxLength: 16 });

describe('storedEnergyKWh', () => {
  it('matches m·c·ΔT for a uniform tank', () => {
    // Worked example: 200 L at 60 °C above 10 °C; m·cp·ΔT with IF97 ρ(60 °C) and mean cp (common practice, within 0.3 %).
    const e = storedEnergyKWh({ layersC: [60, 60, 60, 60], volumeL: 200, refC: 10 });
    const approx = (0.2 * waterDensity(60) * waterCp(35) * 50) / 3.6e6;
    expect(e / approx).toBeCloseTo(1, 2);
    expect(e).toBeGreaterThan(11.3);
    expect(e).toBeLessThan(11.7);
  });

  it('counts nothing for layers at or below the reference', () => {
    const hot = storedEnergyKWh({ layersC: [5, 8, 60, 60], volumeL: 200, refC: 10 });
    const half = storedEnergyKWh({ layersC: [60, 60], volumeL: 100, refC: 10 });
    expect(hot).toBeCloseTo(half, 10);
    expect(storedEnergyKWh({ layersC: [10, 10], volumeL: 200, refC: 10 })).toBe(0);
  });

  it('weights layers by their heights', () => {
    const e = storedEnergyKWh({ layersC: [10, 60], heightsM: [0.75, 0.25], volumeL: 200, refC: 10 });
    expect(e).toBeCloseTo(storedEnergyKWh({ layersC: [60], volumeL: 50, refC: 10 }), 10);
  });

  it('is never negative and never falls when a layer warms (property)', () => {
    fc.assert(
      fc.property(
        layerArb,
        fc.nat(),
        fc.double({ min: 0, max: 20, noNaN: true }),
        fc.double({ min: 0, max: 40, noNaN: true }),
        (t, k, dT, refC) => {
          const base = { layersC: t, volumeL: 180, refC };
          const e0 = storedEnergyKWh(base);
          const i = k % t.length;
          const warmer = t.slice();
          warmer[i] = Math.min(100, warmer[i]! + dT);
          expect(e0).toBeGreaterThanOrEqual(0);
          expect(storedEnergyKWh({ ...base, layersC: warmer })).toBeGreaterThanOrEqual(e0);
        },
      ),
    );
  });
});

describe('mixedWaterLitres', () => {
  it('gives the EN 16147 V40 of a uniform tank', () => {
    // EN 16147: V40 = V·(θ − 10)/(40 − 10) for water at θ mixed with 10 °C cold (from memory of the formula).
    expect(mixedWaterLitres({ layersC: [55, 55, 55], volumeL: 200, coldC: 10, deliveryC: 40 })).toBeCloseTo(300, 9);
  });

  it('counts layers from the top down and stops at the first one below delivery', () => {
    // 4 layers of 50 L: only the top two count; 50·(60−10)/30 + 50·(45−10)/30 (worked example, EN 16147 mixing).
    const v = mixedWaterLitres({ layersC: [50, 30, 45, 60], volumeL: 200, coldC: 10, deliveryC: 40 });
    expect(v).toBeCloseTo((50 * 50) / 30 + (50 * 35) / 30, 9);
    expect(mixedWaterLitres({ layersC: [60, 60, 60, 39.9], volumeL: 200, coldC: 10, deliveryC: 40 })).toBe(0);
  });

  it('never falls when a layer warms (property)', () => {
    fc.assert(
      fc.property(layerArb, fc.nat(), fc.double({ min: 0, max: 30, noNaN: true }), (t, k, dT) => {
        const base = { layersC: t, volumeL: 250, coldC: 10, deliveryC: 40 };
        const v0 = mixedWaterLitres(base);
        const warmer = t.slice();
        const i = k % t.length;
        warmer[i] = Math.min(100, warmer[i]! + dT);
        expect(v0).toBeGreaterThanOrEqual(0);
        expect(mixedWaterLitres({ ...base, layersC: warmer })).toBeGreaterThanOrEqual(v0);
      }),
    );
  });

  it('refuses a delivery temperature at or below the cold water', () => {
    expect(() => mixedWaterLitres({ layersC: [50], volumeL: 200, coldC: 40, deliveryC: 35 })).toThrow(
      /deliveryC is 35 °C: the delivery temperature must be above the cold-water temperature/,
    );
  });
});

describe('stateOfCharge', () => {
  it('averages the clamped charge of each layer', () => {
    // Definition in the tank-monitoring sense (common practice): mean of (T − cold)/(target − cold) clamped to [0, 1].
    expect(stateOfCharge({ layersC: [10, 35, 60, 70], coldC: 10, targetC: 60 })).toBeCloseTo((0 + 0.5 + 1 + 1) / 4, 12);
    expect(stateOfCharge({ layersC: [5, 5], coldC: 10, targetC: 60 })).toBe(0);
  });

  it('stays within 0 and 1 (property)', () => {
    fc.assert(
      fc.property(layerArb, (t) => {
        const s = stateOfCharge({ layersC: t, coldC: 10, targetC: 55 });
        expect(s).toBeGreaterThanOrEqual(0);
        expect(s).toBeLessThanOrEqual(1);
      }),
    );
  });
});

describe('bad layer input', () => {
  it('names the layer that is not a number', () => {
    expect(() => storedEnergyKWh({ layersC: [50, 50, 50, Number.NaN], volumeL: 200, refC: 10 })).toThrow(
      'layersC[3] is NaN: every layer temperature must be a finite number in °C.',
    );
    expect(() => stateOfCharge({ layersC: [50, Number.POSITIVE_INFINITY], coldC: 10, targetC: 60 })).toThrow(
      /layersC\[1\] is Infinity/,
    );
  });

  it('refuses a missing input object with a clear message', () => {
    expect(() => storedEnergyKWh(undefined as never)).toThrow(
      'input is missing: it must be an object { layersC, volumeL, refC }.',
    );
  });

  it('refuses empty layers, negative volume, a target below cold and out-of-range layers', () => {
    expect(() => storedEnergyKWh({ layersC: [], volumeL: 200, refC: 10 })).toThrow(/layersC is empty/);
    expect(() => storedEnergyKWh({ layersC: [50], volumeL: -5, refC: 10 })).toThrow(
      /volumeL is -5: it must be a positive number in litres/,
    );
    expect(() => stateOfCharge({ layersC: [50], coldC: 60, targetC: 50 })).toThrow(ThermalInputError);
    let caught: unknown;
    try {
      mixedWaterLitres({ layersC: [50, 150], volumeL: 200, coldC: 10, deliveryC: 40 });
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(ThermalInputError);
    expect((caught as ThermalInputError).field).toBe('layersC[1]');
  });
});
