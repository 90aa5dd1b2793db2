import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { mixNumber, thermocline, ThermalInputError } from '../../../src/lib/thermal/index.js';

describe('mixNumber (Davidson, Adams & Miller 1994)', () => {
  it('is 0 for a perfectly stratified tank and 1 for a fully mixed one', () => {
    // Davidson et al. (1994), J. Solar Energy Eng. 116: MIX = 0 perfectly stratified, 1 fully mixed.
    expect(mixNumber({ layersC: [10, 10, 10, 60, 60, 60] })).toBeCloseTo(0, 12);
    expect(mixNumber({ layersC: [42, 42, 42, 42] })).toBe(1);
  });

  it('gives the worked value for a linear profile', () => {
    // Worked example from the definition: 4 equal layers 10, 20, 30, 40 over height 1.
    // Energy ∫T dy = 25; moment Σ y·T·Δy = (0.125·10 + 0.375·20 + 0.625·30 + 0.875·40)/4 = 15.625;
    // mixed 25·½ = 12.5; ideal interface y* = (40 − 25)/30 = 0.5, stratified moment 10·0.125 + 40·0.375 = 16.25.
    // MIX = (16.25 − 15.625)/(16.25 − 12.5) = 1/6.
    expect(mixNumber({ layersC: [10, 20, 30, 40] })).toBeCloseTo(1 / 6, 12);
  });

  it('does not depend on the temperature scale or on layer thickness units (property)', () => {
    fc.assert(
      // Temperatures in whole centi-degrees, as readings are stored: a profile flat but for a
      // difference of 1e-8 K has a MIX number that rounding alone decides, and no sensor reports one.
      fc.property(
        fc.array(
          fc.integer({ min: 0, max: 9000 }).map((c) => c / 100),
          { minLength: 2, maxLength: 16 },
        ),
        fc.double({ min: 0, max: 10, noNaN: true }),
        (t, shift) => {
          const a = mixNumber({ layersC: t });
          expect(a).toBeGreaterThanOrEqual(0);
          expect(a).toBeLessThanOrEqual(1);
          expect(mixNumber({ layersC: t.map((x) => x + shift) })).toBeCloseTo(a, 6);
          expect(mixNumber({ layersC: t, heightsM: t.map(() => 0.2) })).toBeCloseTo(a, 9);
        },
      ),
    );
  });

  it('is 0 for any two-zone profile with a sharp interface (property)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 11 }),
        fc.integer({ min: 1, max: 11 }),
        fc.double({ min: 5, max: 40, noNaN: true }),
        fc.double({ min: 1, max: 50, noNaN: true }),
        (cold, hot, tc, dt) => {
          const t = [...Array<number>(cold).fill(tc), ...Array<number>(hot).fill(tc + dt)];
          expect(mixNumber({ layersC: t })).toBeCloseTo(0, 9);
        },
      ),
    );
  });

  it('grows as the thermocline thickens (common practice)', () => {
    const sharp = mixNumber({ layersC: [10, 10, 10, 10, 60, 60, 60, 60] });
    const soft = mixNumber({ layersC: [10, 10, 10, 25, 45, 60, 60, 60] });
    const wide = mixNumber({ layersC: [10, 17, 24, 31, 39, 46, 53, 60] });
    expect(sharp).toBeLessThan(soft);
    expect(soft).toBeLessThan(wide);
  });

  it('refuses heights that do not match the layers', () => {
    expect(() => mixNumber({ layersC: [10, 60], heightsM: [0.5] })).toThrow(
      /heightsM must be an array of 2 layer thicknesses/,
    );
    expect(() => mixNumber({ layersC: [10, 60], heightsM: [0.5, -1] })).toThrow(ThermalInputError);
  });
});

describe('thermocline', () => {
  it('finds a sharp interface at the layer boundary', () => {
    // 10 %/90 % dimensionless-temperature limits (common practice), interpolated between layer centres.
    const r = thermocline({ layersC: [10, 10, 60, 60], tankHeightM: 2 })!;
    expect(r.heightM).toBeCloseTo(1, 12); // θ = 0.5 midway between centres 0.75 m and 1.25 m
    expect(r.bottomM).toBeCloseTo(0.75 + 0.1 * 0.5, 12);
    expect(r.topM).toBeCloseTo(0.75 + 0.9 * 0.5, 12);
    expect(r.thicknessM).toBeCloseTo(0.4, 12);
  });

  it('spans most of the tank for a linear profile', () => {
    const r = thermocline({ layersC: [10, 20, 30, 40, 50], heightsM: [0.3, 0.3, 0.3, 0.3, 0.3] })!;
    expect(r.tankHeightM).toBeCloseTo(1.5, 12);
    expect(r.heightM).toBeCloseTo(0.75, 12);
    expect(r.thicknessM).toBeCloseTo(0.8 * 1.2, 12);
  });

  it('reports no thermocline in a mixed tank', () => {
    expect(thermocline({ layersC: [50, 50.5, 51] })).toBeNull();
  });
});
