// Heat-pump short-cycling: hot-water compressor starts closer together than the configured gap,
// or runs shorter than the configured minimum, counted over a sliding window. Incremental: the
// state carries the last start and the recent violations. Pure: no I/O.
import { shortCycleViolations } from '../../thermal';
import type { Reading } from '../../telemetry/wire';
import type { Thresholds } from '../thresholds';
import { HOUR, MAX_GAP_MS, MIN, clear, fmtTime, round1, unknown, type Finding } from './common';

export interface ShortCycleViolation {
  at: number;
  kind: 'gap' | 'short_run';
  minutes: number;
  start: number;
}
export interface ShortCycleState {
  prevTs: number | null;
  prevOn: boolean | null;
  runStart: number | null;
  lastStart: number | null;
  violations: ShortCycleViolation[];
  /** End of the latest run that started on time and ran long enough: proof of healthy cycling. */
  lastGoodRunEnd: number | null;
  /** Whether the current run's start kept the gap. */
  runStartOk: boolean;
  lastViolationAt: number | null;
}

export const initialShortCycle = (): ShortCycleState => ({
  prevTs: null,
  prevOn: null,
  runStart: null,
  lastStart: null,
  violations: [],
  lastGoodRunEnd: null,
  runStartOk: false,
  lastViolationAt: null,
});

export function stepShortCycle(s: ShortCycleState, r: Reading, th: Thresholds): void {
  if (r.compressor === undefined) return;
  const on = r.compressor;
  // After a silence the readings cannot say whether the compressor stopped or started meanwhile.
  if (s.prevTs !== null && r.ts - s.prevTs > MAX_GAP_MS) {
    s.prevOn = null;
    s.runStart = null;
  }
  if (s.prevOn === false && on) {
    const tooSoon =
      s.lastStart !== null &&
      shortCycleViolations([s.lastStart, r.ts], { minGapMin: th.shortCycleMinGapMin }).length > 0;
    if (tooSoon)
      s.violations.push({ at: r.ts, kind: 'gap', minutes: round1((r.ts - s.lastStart!) / MIN), start: r.ts });
    s.runStartOk = !tooSoon;
    s.lastStart = r.ts;
    s.runStart = r.ts;
  } else if (s.prevOn === true && !on && s.runStart !== null) {
    const minutes = (r.ts - s.runStart) / MIN;
    if (minutes < th.shortCycleMinRunMin)
      s.violations.push({ at: r.ts, kind: 'short_run', minutes: round1(minutes), start: s.runStart });
    else if (s.runStartOk) s.lastGoodRunEnd = r.ts;
    s.runStart = null;
  } else if (s.prevOn === null && on) {
    s.runStart = null; // a run already going: its start was not seen
  }
  s.prevOn = on;
  s.prevTs = r.ts;
  s.lastViolationAt = s.violations[s.violations.length - 1]?.at ?? s.lastViolationAt;
  const from = r.ts - th.shortCycleWindowH * HOUR;
  while (s.violations.length > 0 && s.violations[0]!.at <= from) s.violations.shift();
}

/**
 * Active at N violations in the window; clear once none is left in it and a healthy run (started
 * on time, long enough) has been seen since the last one. Anything between keeps the alert as it
 * is: a heat pump that simply has not run is no proof that it has stopped short-cycling.
 */
export function shortCycleFinding(s: ShortCycleState, at: number, th: Thresholds): Finding {
  const recent = s.violations.filter((v) => v.at > at - th.shortCycleWindowH * HOUR);
  if (recent.length === 0) {
    if (s.lastViolationAt === null) return clear;
    return s.lastGoodRunEnd !== null && s.lastGoodRunEnd > s.lastViolationAt ? clear : unknown;
  }
  if (recent.length < th.shortCycleViolations) return unknown;
  const gaps = recent.filter((v) => v.kind === 'gap').length;
  const short = recent.length - gaps;
  return {
    active: true,
    since: recent[th.shortCycleViolations - 1]!.at,
    evidence: {
      summary: `${recent.length} short cycles in ${th.shortCycleWindowH} h (${gaps} start${gaps === 1 ? '' : 's'} less than ${th.shortCycleMinGapMin} min after the one before, ${short} run${short === 1 ? '' : 's'} shorter than ${th.shortCycleMinRunMin} min), the latest at ${fmtTime(recent[recent.length - 1]!.at)}.`,
      facts: {
        violations: recent.length,
        gapStarts: gaps,
        shortRuns: short,
        minStartGapMin: th.shortCycleMinGapMin,
        minRunMin: th.shortCycleMinRunMin,
        windowH: th.shortCycleWindowH,
      },
      events: recent.slice(-12).map((v) => ({
        kind: 'compressor_run',
        start: v.start,
        end: v.kind === 'short_run' ? v.at : null,
        detail: v.kind === 'gap' ? `started ${v.minutes} min after the previous start` : `ran ${v.minutes} min`,
      })),
      at: recent[0]!.start,
    },
  };
}
