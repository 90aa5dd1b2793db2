/**
 * Thrown when an energy computation is given input it cannot use (a programming or data error,
 * not an expected outcome). `field` names the offending input (e.g. `prices[3]`); the message says
 * what was wrong and what is expected, so callers can show it as is.
 */
export class EnergyInputError extends Error {
  /** Path of the offending input, e.g. `prices[3]` or `limits.hpOutputW`. */
  readonly field: string;

  constructor(field: string, message: string) {
    super(message);
    this.name = 'EnergyInputError';
    this.field = field;
  }
}
