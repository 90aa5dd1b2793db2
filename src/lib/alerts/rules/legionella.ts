// Legionella risk: the stored water was not held at or above the configured temperature (60 °C,
// HSE HSG274 Part 2 (2014)) across the configured share of the volume for the configured time,
// at least once within the window (7 days). Time at temperature is counted as the thermal core's
// legionellaExposure counts it (an interval counts only when the readings at both ends are at or
// above the threshold and at most 15 min apart), but incrementally: each layer's current stretch
// travels in the state, so no history is re-read. Pure: no I/O.
import type { Reading } from '../../telemetry/wire';
import type { Thresholds } from '../thresholds';
import { DAY, MAX_GAP_MS, MIN, clear, fmtTime, round1, unknown, type Finding } from './common';

export interface LegionellaState {
  observedSince: number | null;
  prevTs: number | null;
  /** Per layer: start of its current stretch at or above the threshold. */
  stretchStart: (number | null)[];
  /** Last time the share of the volume held the temperature long enough. */
  lastHeldAt: number | null;
  /** Best share held (0–1) and hottest top reading since then, for the evidence. */
  bestShare: number;
  hottestTopC: number | null;
}

export const initialLegionella = (): LegionellaState => ({
  observedSince: null,
  prevTs: null,
  stretchStart: [],
  lastHeldAt: null,
  bestShare: 0,
  hottestTopC: null,
});

/** Share of the volume (equal layers) whose stretch has lasted `holdMin` at `at`. */
function heldShare(s: LegionellaState, at: number, holdMin: number): number {
  if (s.stretchStart.length === 0) return 0;
  let held = 0;
  for (const from of s.stretchStart) if (from !== null && at - from >= holdMin * MIN) held++;
  return held / s.stretchStart.length;
}

export function stepLegionella(s: LegionellaState, r: Reading, th: Thresholds): void {
  const n = r.layersC.length;
  if (s.stretchStart.length !== n) s.stretchStart = new Array(n).fill(null);
  s.observedSince ??= r.ts;
  const broken = s.prevTs !== null && r.ts - s.prevTs > MAX_GAP_MS;
  for (let i = 0; i < n; i++) {
    const v = r.layersC[i];
    // A missing sensor is no evidence of temperature.
    if (v === null || v === undefined || v < th.legionellaC || broken)
      s.stretchStart[i] = v !== null && v !== undefined && v >= th.legionellaC ? r.ts : null;
    else s.stretchStart[i] ??= r.ts;
  }
  const share = heldShare(s, r.ts, th.legionellaHoldMin);
  if (share >= th.legionellaShare / 100) {
    s.lastHeldAt = r.ts;
    s.bestShare = share;
    s.hottestTopC = null;
  } else {
    s.bestShare = Math.max(s.bestShare, share);
    const top = r.layersC[n - 1];
    if (top !== null && top !== undefined) s.hottestTopC = s.hottestTopC === null ? top : Math.max(s.hottestTopC, top);
  }
  s.prevTs = r.ts;
}

export function legionellaFinding(s: LegionellaState, at: number, th: Thresholds): Finding {
  if (s.observedSince === null) return unknown;
  const windowMs = th.legionellaWindowDays * DAY;
  const reference = s.lastHeldAt ?? s.observedSince;
  if (at - reference <= windowMs) return s.lastHeldAt === null ? unknown : clear;
  const facts = {
    thresholdC: th.legionellaC,
    holdMin: th.legionellaHoldMin,
    sharePct: th.legionellaShare,
    windowDays: th.legionellaWindowDays,
    lastHeldAt: s.lastHeldAt === null ? null : new Date(s.lastHeldAt).toISOString(),
    bestSharePct: Math.round(s.bestShare * 100),
    hottestTopC: s.hottestTopC === null ? null : round1(s.hottestTopC),
  };
  return {
    active: true,
    since: reference + windowMs,
    evidence: {
      summary: `The water has not been held at ${th.legionellaC} °C or above across ${th.legionellaShare}% of the cylinder for ${th.legionellaHoldMin} min ${s.lastHeldAt === null ? `in the ${th.legionellaWindowDays} days it has been watched` : `since ${fmtTime(s.lastHeldAt)}`}; the hottest top reading since was ${facts.hottestTopC ?? '–'} °C.`,
      facts,
      at: reference,
    },
  };
}
