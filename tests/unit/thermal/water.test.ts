import { describe, expect, it } from 'vitest';
import {
  if97Region1,
  waterCp,
  waterDensity,
  waterEnthalpy,
  ThermalInputError,
} from '../../../src/lib/thermal/index.js';

// IAPWS R7-97(2012), IF97 table 5: verification values for region 1 (v m³/kg, h kJ/kg, cp kJ/(kg·K), w m/s).
const TABLE_5 = [
  { T: 300, p: 3, v: 0.100215168e-2, h: 0.115331273e3, cp: 0.417301218e1, w: 0.150773921e4 },
  { T: 300, p: 80, v: 0.971180894e-3, h: 0.184142828e3, cp: 0.401008987e1, w: 0.163469054e4 },
  { T: 500, p: 3, v: 0.1202418e-2, h: 0.975542239e3, cp: 0.465580682e1, w: 0.124071337e4 },
];

describe('IAPWS-IF97 region 1', () => {
  for (const row of TABLE_5) {
    it(`reproduces IF97 table 5 at T=${row.T} K, p=${row.p} MPa`, () => {
      const r = if97Region1(row.T, row.p);
      expect(r.specificVolumeM3PerKg / row.v).toBeCloseTo(1, 8);
      expect(r.enthalpyKJPerKg / row.h).toBeCloseTo(1, 8);
      expect(r.cpKJPerKgK / row.cp).toBeCloseTo(1, 8);
      expect(r.speedOfSoundMPerS / row.w).toBeCloseTo(1, 7);
    });
  }

  it('gives handbook values for water at 40 °C', () => {
    // Heat-transfer handbook tables (e.g. Incropera, saturated water): about 992.2 kg/m³ and 4.179 kJ/(kg·K) at 40 °C.
    expect(waterDensity(40)).toBeGreaterThan(992.0);
    expect(waterDensity(40)).toBeLessThan(992.5);
    expect(waterCp(40) / 1000).toBeCloseTo(4.179, 2);
  });

  it('tabulated values agree with the full equation between grid points', () => {
    // Interpolation of the IF97 table must not drift from IF97 itself (common practice: < 0.001 %).
    for (const c of [3.37, 41.05, 59.99, 88.88]) {
      const exact = if97Region1(273.15 + c, 0.3);
      expect(waterDensity(c) / exact.densityKgPerM3).toBeCloseTo(1, 6);
    }
    expect(waterEnthalpy(0)).toBe(0);
    // IF97: h(60 °C) − h(10 °C) ≈ 209.3 kJ/kg at low pressure (steam tables, from memory).
    expect((waterEnthalpy(60) - waterEnthalpy(10)) / 1000).toBeCloseTo(209.3, 0);
  });

  it('refuses temperatures outside liquid water in a cylinder', () => {
    expect(() => waterDensity(120)).toThrow(ThermalInputError);
    expect(() => waterCp(Number.NaN)).toThrow(/tempC is NaN/);
    expect(() => if97Region1(200, 3)).toThrow(/273.15 K to 623.15 K/);
  });
});
