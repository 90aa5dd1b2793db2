/**
 * Thrown when a thermal computation is given input it cannot use.
 * `field` names the offending input (e.g. `layersC[3]`); the message says
 * what was wrong and what is expected, so callers can show it as is.
 */
export class ThermalInputError extends Error {
  /** Path of the offending input, e.g. `layersC[3]` or `spec.volumeL`. */
  readonly field: string;

  constructor(field: string, message: string) {
    super(message);
    this.name = 'ThermalInputError';
    this.field = field;
  }
}
