// Heat loss above the cylinder's declared standing loss: each long enough period with no heating
// and no draw is fitted with the thermal core's standingLoss (Newton's law of cooling) and its loss
// at 45 K compared with the declared figure plus the configured margin; two fits in a row over the
// line raise the alert, two under clear it. Pure: no I/O.
import { standingLoss } from '../../thermal';
import { MIN_DRAW_LPM } from '../../telemetry/events';
import type { Reading } from '../../telemetry/wire';
import type { Thresholds } from '../thresholds';
import { HOUR, MAX_GAP_MS, MIN, clear, fmtTime, round1, unknown, type Finding } from './common';

/** The loop and the layers settle for a while after heating stops (common practice). */
const SETTLE_MS = 20 * MIN;
const SAMPLE_EVERY_MS = 10 * MIN;
/** The thermal core's shortest reliable cooling period (its default), and the longest we wait to fit. */
const MIN_PERIOD_MS = 4 * HOUR;
const MAX_PERIOD_MS = 10 * HOUR;
const FITS_TO_DECIDE = 2;

export interface HeatLossFit {
  start: number;
  end: number;
  lossW: number;
  declaredW: number;
}
export interface HeatLossState {
  idleSince: number | null;
  prevTs: number | null;
  samples: { t: number; meanC: number }[];
  fits: HeatLossFit[];
}

export const initialHeatLoss = (): HeatLossState => ({ idleSince: null, prevTs: null, samples: [], fits: [] });

function closePeriod(s: HeatLossState, volumeL: number, declaredW: number | null, th: Thresholds): void {
  const first = s.samples[0];
  const last = s.samples[s.samples.length - 1];
  if (declaredW !== null && first && last && last.t - first.t >= MIN_PERIOD_MS) {
    try {
      const fit = standingLoss(s.samples, { volumeL, ambientC: th.heatLossAmbientC });
      s.fits.push({ start: first.t, end: last.t, lossW: round1(fit.lossWAt45K), declaredW });
      if (s.fits.length > 4) s.fits.shift();
    } catch {
      // A period the fit refuses (noisy, too close to ambient) says nothing either way.
    }
  }
  s.idleSince = null;
  s.samples = [];
}

/**
 * One reading. `meanC`: the column's mean temperature from the tank's figures (`columnMeanC` of
 * `tankFigures`' layers, a doubted sensor estimated by height; null when the figures are withheld:
 * the period breaks there, since a cooling curve cannot span a column nobody can read).
 */
export function stepHeatLoss(
  s: HeatLossState,
  r: Reading,
  meanC: number | null,
  volumeL: number,
  declaredW: number | null,
  th: Thresholds,
): void {
  const idle = meanC !== null && r.compressor !== true && !((r.immersionW ?? 0) > 0) && (r.drawLpm ?? 0) < MIN_DRAW_LPM;
  const gap = s.prevTs !== null && r.ts - s.prevTs > MAX_GAP_MS;
  if (!idle || gap) closePeriod(s, volumeL, declaredW, th);
  if (idle) {
    s.idleSince ??= r.ts;
    const lastT = s.samples[s.samples.length - 1]?.t ?? -Infinity;
    if (meanC !== null && r.ts - s.idleSince >= SETTLE_MS && r.ts - lastT >= SAMPLE_EVERY_MS)
      s.samples.push({ t: r.ts, meanC });
    if (s.samples.length > 0 && r.ts - s.samples[0]!.t >= MAX_PERIOD_MS) closePeriod(s, volumeL, declaredW, th);
  }
  s.prevTs = r.ts;
}

export function heatLossFinding(s: HeatLossState, th: Thresholds): Finding {
  const recent = s.fits.slice(-FITS_TO_DECIDE);
  if (recent.length < FITS_TO_DECIDE) return unknown;
  const over = (f: HeatLossFit) => f.lossW > f.declaredW * (1 + th.heatLossMarginPct / 100);
  if (recent.every((f) => !over(f))) return clear;
  if (!recent.every(over)) return unknown;
  const f = recent[recent.length - 1]!;
  return {
    active: true,
    since: f.end,
    evidence: {
      summary: `Cooling curves give a standing loss of ${recent.map((x) => `${Math.round(x.lossW)} W`).join(' and ')} at 45 K, more than ${th.heatLossMarginPct}% above the declared ${Math.round(f.declaredW)} W (latest period ${fmtTime(f.start)} to ${fmtTime(f.end)}).`,
      facts: { lossW: f.lossW, declaredW: f.declaredW, marginPct: th.heatLossMarginPct, ambientC: th.heatLossAmbientC },
      events: recent.map((x) => ({
        kind: 'cooling_period',
        start: x.start,
        end: x.end,
        detail: `${Math.round(x.lossW)} W at 45 K`,
      })),
      at: f.start,
    },
  };
}
