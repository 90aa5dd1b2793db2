// Input guards shared by the thermal modules. Each throws ThermalInputError
// naming the field, so no NaN ever leaves this library.
import { ThermalInputError } from './errors.js';

/** Lowest and highest layer temperature accepted, °C (liquid water in a cylinder). */
const MIN_WATER_C = 0;
const MAX_WATER_C = 100;

function describe(value: unknown): string {
  if (typeof value === 'number') return Number.isNaN(value) ? 'NaN' : String(value);
  if (value === undefined) return 'missing';
  if (value === null) return 'null';
  return `a ${typeof value}`;
}

/** A finite number; `what` finishes the sentence "… must be …". */
export function finite(field: string, value: unknown, what = 'a finite number'): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new ThermalInputError(field, `${field} is ${describe(value)}: it must be ${what}.`);
  }
  return value;
}

export function positive(field: string, value: unknown, unit: string): number {
  const v = finite(field, value, `a positive number in ${unit}`);
  if (v <= 0) throw new ThermalInputError(field, `${field} is ${v}: it must be a positive number in ${unit}.`);
  return v;
}

export function nonNegative(field: string, value: unknown, unit: string): number {
  const v = finite(field, value, `a number ≥ 0 in ${unit}`);
  if (v < 0) throw new ThermalInputError(field, `${field} is ${v}: it must be a number ≥ 0 in ${unit}.`);
  return v;
}

/** A water temperature in °C within the range the property tables cover. */
export function waterTemp(field: string, value: unknown): number {
  const v = finite(field, value, 'a finite number in °C');
  if (v < MIN_WATER_C || v > MAX_WATER_C) {
    throw new ThermalInputError(
      field,
      `${field} is ${v} °C: water temperatures must be between ${MIN_WATER_C} and ${MAX_WATER_C} °C.`,
    );
  }
  return v;
}

/** A non-empty array of layer temperatures, bottom to top, each a liquid-water temperature in °C. */
export function layers(field: string, value: unknown): readonly number[] {
  if (!Array.isArray(value)) {
    throw new ThermalInputError(
      field,
      `${field} is ${describe(value)}: it must be an array of layer temperatures in °C, bottom to top.`,
    );
  }
  if (value.length === 0) {
    throw new ThermalInputError(field, `${field} is empty: at least one layer temperature in °C is needed.`);
  }
  for (let i = 0; i < value.length; i++) {
    const t = value[i];
    if (typeof t !== 'number' || !Number.isFinite(t)) {
      throw new ThermalInputError(
        `${field}[${i}]`,
        `${field}[${i}] is ${describe(t)}: every layer temperature must be a finite number in °C.`,
      );
    }
    if (t < MIN_WATER_C || t > MAX_WATER_C) {
      throw new ThermalInputError(
        `${field}[${i}]`,
        `${field}[${i}] is ${t} °C: every layer temperature must be between ${MIN_WATER_C} and ${MAX_WATER_C} °C.`,
      );
    }
  }
  return value as readonly number[];
}

/** Optional per-layer thicknesses in metres; returns equal shares (summing to `defaultTotal`) when absent. */
export function layerHeights(field: string, value: unknown, count: number, defaultTotal = 1): number[] {
  if (value === undefined) return new Array<number>(count).fill(defaultTotal / count);
  if (!Array.isArray(value) || value.length !== count) {
    throw new ThermalInputError(
      field,
      `${field} must be an array of ${count} layer thicknesses in metres, one per layer (got ${Array.isArray(value) ? value.length : describe(value)}).`,
    );
  }
  return value.map((h, i) => positive(`${field}[${i}]`, h, 'metres'));
}

/** The options object a function takes; `shape` lists its fields for the message. */
export function record<T>(field: string, value: T, shape: string): T {
  if (typeof value !== 'object' || value === null) {
    throw new ThermalInputError(field, `${field} is ${describe(value)}: it must be an object ${shape}.`);
  }
  return value;
}
