// Evidence that stored water got hot enough, for long enough, to control legionella.
// UK HSE HSG274 Part 2 (2014): store hot water at 60 °C or above (thresholdC 60 is the usual choice).
import { ThermalInputError } from './errors.js';
import { finite, layerHeights, layers, positive, record } from './validate.js';

/** One reading of the layer temperatures: epoch milliseconds and °C bottom to top. */
export interface LayerSample {
  t: number;
  layersC: readonly number[];
}

/** Exposure of each layer over the series. */
export interface LegionellaExposure {
  /** Minutes each layer spent at or above the threshold, bottom to top. */ minutesAtOrAbove: number[];
  /** Longest unbroken stretch at or above the threshold per layer, minutes. */ longestStretchMin: number[];
  /** Whether each layer held the threshold for `holdMin` in one stretch. */ layerHeld: boolean[];
  /** Fraction of the volume (0–1) whose layers held the threshold for `holdMin` in one stretch. */ heldFraction: number;
}

/**
 * Per-layer time at or above `thresholdC` (°C) over `series` (strictly increasing `t`), and the
 * fraction of the volume that held it for `holdMin` minutes in one stretch. An interval between two
 * readings counts for a layer only when both readings are at or above the threshold and the readings
 * are at most `maxGapMin` apart (default 15 min): a gap in telemetry is never counted as evidence.
 * `heightsM` (layer thicknesses, m) weights the volume fraction; default equal layers.
 */
export function legionellaExposure(
  series: readonly LayerSample[],
  options: { thresholdC: number; holdMin: number; maxGapMin?: number; heightsM?: readonly number[] },
): LegionellaExposure {
  record('options', options, '{ thresholdC, holdMin }');
  const threshold = finite('thresholdC', options.thresholdC, 'a temperature in °C');
  const holdMin = positive('holdMin', options.holdMin, 'minutes');
  const maxGapMs = (options.maxGapMin === undefined ? 15 : positive('maxGapMin', options.maxGapMin, 'minutes')) * 60000;
  if (!Array.isArray(series) || series.length === 0) {
    throw new ThermalInputError('series', 'series is empty: at least one reading { t, layersC } is needed.');
  }
  const n = layers('series[0].layersC', series[0]?.layersC).length;
  const minutes = new Array<number>(n).fill(0);
  const longest = new Array<number>(n).fill(0);
  const current = new Array<number>(n).fill(0);
  let prev: readonly number[] | null = null;
  let prevT = -Infinity;
  for (let k = 0; k < series.length; k++) {
    const s = series[k]!;
    const t = finite(`series[${k}].t`, s?.t, 'a time in epoch milliseconds');
    const row = layers(`series[${k}].layersC`, s.layersC);
    if (row.length !== n) {
      throw new ThermalInputError(
        `series[${k}].layersC`,
        `series[${k}].layersC has ${row.length} layers: every reading must have the same ${n} layers as the first.`,
      );
    }
    if (t <= prevT) {
      throw new ThermalInputError(
        `series[${k}].t`,
        `series[${k}].t is not after series[${k - 1}].t: readings must be in strictly increasing time order.`,
      );
    }
    if (prev) {
      const gap = t - prevT;
      for (let i = 0; i < n; i++) {
        if (gap <= maxGapMs && prev[i]! >= threshold && row[i]! >= threshold) {
          minutes[i]! += gap / 60000;
          current[i]! += gap / 60000;
          if (current[i]! > longest[i]!) longest[i] = current[i]!;
        } else {
          current[i] = 0;
        }
      }
    }
    prev = row;
    prevT = t;
  }
  const h = layerHeights('heightsM', options.heightsM, n);
  const total = h.reduce((a, b) => a + b, 0);
  const held = longest.map((m) => m >= holdMin);
  let fraction = 0;
  for (let i = 0; i < n; i++) if (held[i]) fraction += h[i]! / total;
  return {
    minutesAtOrAbove: minutes,
    longestStretchMin: longest,
    layerHeld: held,
    heldFraction: Math.min(1, fraction),
  };
}
