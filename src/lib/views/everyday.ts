// What a number of litres at 40 °C means at home: showers and baths, with the assumptions shown.
import { tappingProfile, waterCp, waterDensity } from '../thermal';
import { COLD_WATER_C, V40_DELIVERY_C } from './layers';

/** Litres of water at 40 °C (from cold at 10 °C) that carry `kWh` of useful heat. */
export function litresAt40ForEnergy(kWh: number): number {
  const jPerLitreK = (waterDensity(V40_DELIVERY_C) / 1000) * waterCp(V40_DELIVERY_C);
  return (kWh * 3.6e6) / (jPerLitreK * (V40_DELIVERY_C - COLD_WATER_C));
}

/**
 * Default sizes of a shower and a bath, from the EN 16147 tapping cycles: the shower draw of
 * profile M (1.4 kWh) and the bath draw of profile L (3.605 kWh), as litres at 40 °C.
 */
export function defaultAssumptions(): { showerL: number; bathL: number } {
  const shower = tappingProfile('M').draws.find((d) => d.tap === 'shower')!;
  const bath = tappingProfile('L').draws.find((d) => d.tap === 'bath')!;
  return {
    showerL: Math.round(litresAt40ForEnergy(shower.energyKWh)),
    bathL: Math.round(litresAt40ForEnergy(bath.energyKWh)),
  };
}

export interface Everyday {
  showers: number;
  baths: number;
}

/** Whole showers and whole baths the warm water would give (each on its own, not both). */
export function everydayEquivalents(v40L: number, a: { showerL: number; bathL: number }): Everyday {
  const whole = (size: number) => (size > 0 && Number.isFinite(size) ? Math.max(0, Math.floor(v40L / size + 1e-9)) : 0);
  return { showers: whole(a.showerL), baths: whole(a.bathL) };
}

/** "about 3 showers" style words, never a fraction. */
export function plural(n: number, one: string, many: string): string {
  return `${n} ${n === 1 ? one : many}`;
}
