// The resistances a cylinder controller presents to a heat pump's hot-water sensor input, with
// the arithmetic written out so the engineer can check it. The numbers come from the thermal
// core (src/lib/thermal/ntc.ts); this module only formats them.
import { thermistorSettings, type BetaThermistor } from '../thermal/index';

export interface SettingLine {
  /** "call" (cylinder wants heat) or "satisfied" (cylinder is hot enough). */
  which: 'call' | 'satisfied';
  tempC: number;
  ohm: number;
  /** The Beta equation with this case's numbers substituted, step by step. */
  working: string[];
}

export interface ThermistorWorking {
  sensor: BetaThermistor;
  lines: SettingLine[];
}

export const BETA_EQUATION = 'R = R25 · exp(B · (1/T − 1/298.15 K)), T in kelvin';

const kelvin = (c: number) => c + 273.15;
const fmt = (n: number, digits: number) =>
  n.toLocaleString('en-GB', { minimumFractionDigits: digits, maximumFractionDigits: digits });

/** Ohms as people set them on a controller: 24 834 Ω → "24.83 kΩ". */
export function formatOhm(ohm: number): string {
  return ohm >= 1000 ? `${fmt(ohm / 1000, 2)} kΩ` : `${fmt(ohm, 0)} Ω`;
}

function working(tempC: number, sensor: BetaThermistor, ohm: number): string[] {
  const t = kelvin(tempC);
  const inner = 1 / t - 1 / 298.15;
  const exponent = sensor.betaK * inner;
  return [
    `T = ${fmt(tempC, 1)} °C + 273.15 = ${fmt(t, 2)} K`,
    `1/T − 1/298.15 K = ${inner.toExponential(4)} K⁻¹`,
    `B · (1/T − 1/298.15 K) = ${fmt(sensor.betaK, 0)} × ${inner.toExponential(4)} = ${fmt(exponent, 4)}`,
    `R = ${fmt(sensor.r25Ohm, 0)} Ω × exp(${fmt(exponent, 4)}) = ${fmt(ohm, 0)} Ω (${formatOhm(ohm)})`,
  ];
}

/** The two settings and their working, or throws the thermal core's ThermalInputError naming the bad input. */
export function thermistorWorking(input: {
  sensor: BetaThermistor;
  callC: number;
  satisfiedC: number;
}): ThermistorWorking {
  const s = thermistorSettings(input);
  return {
    sensor: input.sensor,
    lines: [
      { which: 'call', tempC: input.callC, ohm: s.callOhm, working: working(input.callC, input.sensor, s.callOhm) },
      {
        which: 'satisfied',
        tempC: input.satisfiedC,
        ohm: s.satisfiedOhm,
        working: working(input.satisfiedC, input.sensor, s.satisfiedOhm),
      },
    ],
  };
}
