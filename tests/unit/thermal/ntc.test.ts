import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  ntcResistance,
  ntcTemperature,
  steinhartHartCoefficients,
  steinhartHartTemperature,
  thermistorSettings,
  ThermalInputError,
} from '../../../src/lib/thermal/index.js';

const sensor = { r25Ohm: 10_000, betaK: 3977 };

describe('Beta-model NTC', () => {
  it('reads 10 kΩ at 25 °C', () => {
    // Definition of R25 in the Beta equation.
    expect(ntcResistance(25, sensor)).toBeCloseTo(10_000, 6);
  });

  it('puts about 25 kΩ near 6 °C and about 4 kΩ near 47 °C for B = 3977 K', () => {
    // 10 kΩ NTC hot-water sensor inputs: ≈ 25 kΩ reads cold (≈ 6 °C), ≈ 4 kΩ reads satisfied (≈ 47 °C) (common practice).
    expect(ntcResistance(6, sensor) / 1000).toBeCloseTo(24.8, 1);
    expect(ntcResistance(47, sensor) / 1000).toBeCloseTo(4.0, 1);
    expect(ntcTemperature(25_000, sensor)).toBeCloseTo(5.8, 1);
    expect(ntcTemperature(4_000, sensor)).toBeCloseTo(47.0, 1);
  });

  it('round-trips temperature → resistance → temperature (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -20, max: 120, noNaN: true }),
        fc.double({ min: 1000, max: 100000, noNaN: true }),
        fc.double({ min: 2500, max: 4500, noNaN: true }),
        (t, r25, b) => {
          const s = { r25Ohm: r25, betaK: b };
          expect(ntcTemperature(ntcResistance(t, s), s)).toBeCloseTo(t, 8);
        },
      ),
    );
  });

  it('refuses a non-positive resistance or a missing sensor', () => {
    expect(() => ntcTemperature(0, sensor)).toThrow(/ohm is 0: it must be a positive number in ohms/);
    expect(() => ntcResistance(20, { r25Ohm: 10_000, betaK: Number.NaN })).toThrow(/sensor.betaK is NaN/);
  });
});

describe('Steinhart–Hart', () => {
  it('coefficients through three points reproduce those points', () => {
    // Steinhart & Hart (1968), Deep-Sea Research 15, 497: 1/T = a + b ln R + c (ln R)³ through three calibration points.
    const points = [0, 40, 80].map((tempC) => ({ tempC, ohm: ntcResistance(tempC, sensor) }));
    const k = steinhartHartCoefficients(points);
    for (const p of points) expect(steinhartHartTemperature(p.ohm, k)).toBeCloseTo(p.tempC, 9);
    // Between the points it follows the Beta curve to well under 0.1 K (common practice for a 0–80 °C span).
    for (const t of [10, 25, 55, 70])
      expect(Math.abs(steinhartHartTemperature(ntcResistance(t, sensor), k) - t)).toBeLessThan(0.1);
    // For a Beta curve the cubic term is small next to the linear one.
    expect(Math.abs(k.c)).toBeLessThan(Math.abs(k.b) * 1e-2);
  });

  it('reduces to the Beta model when c = 0', () => {
    // With c = 0, a = 1/T25 − ln(R25)/B and b = 1/B is the Beta equation (algebra of the two forms).
    const k = { a: 1 / 298.15 - Math.log(10_000) / 3977, b: 1 / 3977, c: 0 };
    for (const t of [5, 47, 60]) expect(steinhartHartTemperature(ntcResistance(t, sensor), k)).toBeCloseTo(t, 9);
  });

  it('refuses coefficients that give a non-physical temperature', () => {
    expect(() => steinhartHartTemperature(10_000, { a: -1, b: 0, c: 0 })).toThrow(ThermalInputError);
  });
});

describe('thermistorSettings', () => {
  it('gives the resistances for call and satisfied temperatures', () => {
    // Same check values as above (common practice): ≈ 25 kΩ to call for heat, ≈ 4 kΩ when satisfied.
    const r = thermistorSettings({ sensor, callC: 6, satisfiedC: 47 });
    expect(r.callOhm / 1000).toBeCloseTo(24.8, 1);
    expect(r.satisfiedOhm / 1000).toBeCloseTo(4.0, 1);
    expect(r.callOhm).toBeGreaterThan(r.satisfiedOhm);
  });

  it('refuses a call temperature at or above the satisfied one', () => {
    expect(() => thermistorSettings({ sensor, callC: 50, satisfiedC: 45 })).toThrow(
      /callC is 50 °C: the call-for-heat temperature must be below/,
    );
  });
});
