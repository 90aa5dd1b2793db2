import { describe, expect, it } from 'vitest';
import { formatOhm, thermistorWorking } from '../../../src/lib/commissioning/thermistor';
import { thermistorSettings, ThermalInputError } from '../../../src/lib/thermal/index';

// 10 kΩ NTC hot-water sensor input, B ≈ 3977 K (common practice for heat-pump cylinder sensors).
const sensor = { r25Ohm: 10_000, betaK: 3977 };

describe('thermistor settings shown by the wizard', () => {
  it('are the thermal core’s values, ≈ 25 kΩ to call at ≈ 6 °C and ≈ 4 kΩ satisfied at ≈ 47 °C', () => {
    const w = thermistorWorking({ sensor, callC: 6, satisfiedC: 47 });
    const core = thermistorSettings({ sensor, callC: 6, satisfiedC: 47 });
    expect(w.lines.map((l) => l.ohm)).toEqual([core.callOhm, core.satisfiedOhm]);
    // Check values (common practice): ≈ 25 kΩ reads cold (≈ 6 °C), ≈ 4 kΩ reads satisfied (≈ 47 °C).
    expect(w.lines[0].ohm / 1000).toBeCloseTo(24.8, 1);
    expect(w.lines[1].ohm / 1000).toBeCloseTo(4.0, 1);
    // By hand: 3977 × (1/279.15 − 1/298.15) = 0.9079; 10 000 × e^0.9079 = 24 791 Ω.
    expect(formatOhm(w.lines[0].ohm)).toBe('24.79 kΩ');
  });

  it('writes the Beta equation out with this case’s numbers', () => {
    const [call] = thermistorWorking({ sensor, callC: 6, satisfiedC: 47 }).lines;
    // Beta equation: R = R25 · exp(B · (1/T − 1/298.15 K)); 6 °C = 279.15 K.
    expect(call.working[0]).toBe('T = 6.0 °C + 273.15 = 279.15 K');
    const inner = 1 / 279.15 - 1 / 298.15;
    expect(call.working[1]).toContain(inner.toExponential(4));
    expect(call.working[3]).toBe('R = 10,000 Ω × exp(0.9079) = 24,791 Ω (24.79 kΩ)');
  });

  it('passes on the thermal core’s refusal of a call temperature above the satisfied one', () => {
    expect(() => thermistorWorking({ sensor, callC: 50, satisfiedC: 45 })).toThrow(ThermalInputError);
  });

  it('formats small resistances in ohms', () => {
    expect(formatOhm(680)).toBe('680 Ω');
  });
});
