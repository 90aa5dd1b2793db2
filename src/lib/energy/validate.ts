// Argument checks shared by the energy modules: each names the field and the unit it expects.
import { EnergyInputError } from './errors.js';

export function finite(field: string, value: unknown, what: string): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new EnergyInputError(field, `${field} is ${String(value)}: it must be a finite number (${what}).`);
  }
  return value;
}

export function nonNegative(field: string, value: unknown, unit: string): number {
  const v = finite(field, value, unit);
  if (v < 0) throw new EnergyInputError(field, `${field} is ${v}: it must be zero or more (${unit}).`);
  return v;
}

export function positive(field: string, value: unknown, unit: string): number {
  const v = finite(field, value, unit);
  if (v <= 0) throw new EnergyInputError(field, `${field} is ${v}: it must be more than zero (${unit}).`);
  return v;
}

export function wholeIn(field: string, value: unknown, lo: number, hi: number): number {
  const v = finite(field, value, `a whole number from ${lo} to ${hi}`);
  if (!Number.isInteger(v) || v < lo || v > hi) {
    throw new EnergyInputError(field, `${field} is ${v}: it must be a whole number from ${lo} to ${hi}.`);
  }
  return v;
}

export function epochMs(field: string, value: unknown): number {
  const v = finite(field, value, 'epoch milliseconds');
  if (!Number.isInteger(v)) throw new EnergyInputError(field, `${field} is ${v}: it must be whole epoch milliseconds.`);
  return v;
}
