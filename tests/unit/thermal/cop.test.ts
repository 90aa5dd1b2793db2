import { describe, expect, it } from 'vitest';
import { carnotCop, dhwCop, estimatedCop } from '../../../src/lib/thermal/index.js';

describe('coefficients of performance', () => {
  it('gives the Carnot COP in kelvin', () => {
    // Carnot heating COP = T_hot/(T_hot − T_cold), kelvin (any thermodynamics text): 55 °C water, 7 °C air → 328.15/48.
    expect(carnotCop({ sinkC: 55, sourceC: 7 })).toBeCloseTo(328.15 / 48, 12);
    expect(carnotCop({ sinkC: 35, sourceC: -5 })).toBeCloseTo(308.15 / 40, 12);
  });

  it('estimates a real COP as a fraction of Carnot', () => {
    // Quality grade ≈ 0.4 for air-source heat pumps (common practice).
    expect(estimatedCop({ sinkC: 55, sourceC: 7 })).toBeCloseTo(0.4 * (328.15 / 48), 12);
    expect(() => estimatedCop({ sinkC: 55, sourceC: 7, qualityGrade: 1.2 })).toThrow(/at most 1/);
  });

  it('gives the hot-water COP from heat delivered and electricity used', () => {
    // Definition: COP = heat delivered / electricity used.
    expect(dhwCop({ heatDeliveredKWh: 5.845, electricityKWh: 2.5 })).toBeCloseTo(2.338, 12);
  });

  it('refuses impossible inputs', () => {
    expect(() => carnotCop({ sinkC: 7, sourceC: 55 })).toThrow(
      /sinkC is 7 °C: the sink \(water\) must be warmer than the source/,
    );
    expect(() => dhwCop({ heatDeliveredKWh: 3, electricityKWh: 0 })).toThrow(/electricityKWh is 0/);
    expect(() => dhwCop({ heatDeliveredKWh: Number.NaN, electricityKWh: 1 })).toThrow(/heatDeliveredKWh is NaN/);
  });
});
