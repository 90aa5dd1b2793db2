// Compressor runs and short-cycling, from on/off samples of the heat pump's hot-water demand.
import { ThermalInputError } from './errors.js';
import { finite, positive, record } from './validate.js';

/** One observation: epoch milliseconds and whether the compressor was running. */
export interface OnOffSample {
  t: number;
  on: boolean;
}

/** One compressor run: epoch milliseconds and its length in minutes. */
export interface CompressorRun {
  start: number;
  end: number;
  minutes: number;
  /** False when the run was already going at the first sample or still going at the last. */
  complete: boolean;
}

/**
 * Compressor starts (epoch ms of each observed off → on change) and runs, from samples in strictly
 * increasing time order. A run starts at the first "on" sample after an "off" and ends at the next
 * "off" sample. A run already under way at the first sample is listed in `runs` (incomplete) but not
 * counted among `starts`, since its start was not seen; a run still going at the end ends at the
 * last sample and is marked incomplete.
 */
export function compressorCycles(samples: readonly OnOffSample[]): { starts: number[]; runs: CompressorRun[] } {
  if (!Array.isArray(samples)) {
    throw new ThermalInputError('samples', 'samples must be an array of { t, on } readings in time order.');
  }
  const starts: number[] = [];
  const runs: CompressorRun[] = [];
  let runStart: number | null = null;
  let seenStart = false;
  let prevT = -Infinity;
  for (let i = 0; i < samples.length; i++) {
    const s = samples[i]!;
    const t = finite(`samples[${i}].t`, s?.t, 'a time in epoch milliseconds');
    if (typeof s.on !== 'boolean') {
      throw new ThermalInputError(
        `samples[${i}].on`,
        `samples[${i}].on is ${String(s.on)}: it must be true (running) or false (stopped).`,
      );
    }
    if (t <= prevT) {
      throw new ThermalInputError(
        `samples[${i}].t`,
        `samples[${i}].t is not after samples[${i - 1}].t: samples must be in strictly increasing time order.`,
      );
    }
    prevT = t;
    if (s.on && runStart === null) {
      runStart = t;
      seenStart = i > 0;
      if (seenStart) starts.push(t);
    } else if (!s.on && runStart !== null) {
      runs.push({ start: runStart, end: t, minutes: (t - runStart) / 60000, complete: seenStart });
      runStart = null;
    }
  }
  if (runStart !== null) {
    const end = samples[samples.length - 1]!.t;
    runs.push({ start: runStart, end, minutes: (end - runStart) / 60000, complete: false });
  }
  return { starts, runs };
}

/**
 * The starts that follow the previous start by less than `minGapMin` minutes (a start exactly
 * `minGapMin` after the previous one is allowed). Accepts start times (epoch ms) or runs with a
 * `start`, in time order, and returns the offending items. The usual rule of thumb is at most one
 * hot-water compressor start per hour, minGapMin = 60 (common practice); companies set their own.
 */
export function shortCycleViolations<S extends number | { start: number }>(
  starts: readonly S[],
  options: { minGapMin: number },
): S[] {
  if (!Array.isArray(starts)) {
    throw new ThermalInputError('starts', 'starts must be an array of start times in epoch milliseconds.');
  }
  record('options', options, '{ minGapMin }');
  const gapMs = positive('minGapMin', options.minGapMin, 'minutes') * 60000;
  const out: S[] = [];
  let prev = -Infinity;
  for (let i = 0; i < starts.length; i++) {
    const item = starts[i]!;
    const t = finite(
      `starts[${i}]`,
      typeof item === 'number' ? item : item?.start,
      'a start time in epoch milliseconds',
    );
    if (t < prev) {
      throw new ThermalInputError(
        `starts[${i}]`,
        `starts[${i}] is before starts[${i - 1}]: starts must be in time order.`,
      );
    }
    if (t - prev < gapMs) out.push(item);
    prev = t;
  }
  return out;
}
