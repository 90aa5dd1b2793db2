// Standing loss from quiet periods and legionella exposure over a window, for the tank view.
import {
  columnMeanC,
  erpClass,
  legionellaExposure,
  standingLoss,
  ThermalInputError,
  type CoolingSample,
} from '../thermal';
import { defaultThresholds } from '../alerts/thresholds';
import type { TankAnalysis } from './contracts';
import { complete, layerThicknesses, type TankShape } from './layers';
import type { SeriesRow } from './series';
import { figuresOverTime, pointQuality, windowQuality } from './figures-over-time';

/**
 * Air around an indoor cylinder, °C, assumed for the cooling fit: the ambient of the standing-loss
 * test in EN 12897 (20 °C, from memory). The page shows the assumption.
 */
const ASSUMED_AMBIENT_C = 20;
/** Shortest quiet stretch worth fitting, hours (the thermal core's default is 4). */
const MIN_QUIET_H = 4;

/** Stretches with no heating and no draw and every sensor reading, longest first. */
export function quietPeriods(rows: readonly SeriesRow[], maxGapMs = 15 * 60_000): SeriesRow[][] {
  const out: SeriesRow[][] = [];
  let run: SeriesRow[] = [];
  const flush = () => {
    if (run.length > 2) out.push(run);
    run = [];
  };
  for (const r of rows) {
    const quiet = r.compressor === 0 && (r.immersion ?? 0) === 0 && (r.drawLpm ?? 0) === 0 && complete(r.layersC);
    const last = run[run.length - 1];
    if (!quiet || (last && r.t - last.t > maxGapMs)) flush();
    if (quiet) run.push(r);
  }
  flush();
  return out.sort((a, b) => b[b.length - 1]!.t - b[0]!.t - (a[a.length - 1]!.t - a[0]!.t));
}

/** Legionella exposure is counted against the alert rule's temperature and hold (the company's settings). */
export interface LegionellaSettings {
  thresholdC: number;
  holdMin: number;
}
const defaultLegionella: LegionellaSettings = {
  thresholdC: defaultThresholds.legionellaC,
  holdMin: defaultThresholds.legionellaHoldMin,
};

/**
 * Standing loss and legionella exposure over a window. Each reading's column is the thermal core's
 * (a doubted sensor left out and its layer estimated; a withheld reading not used), so the analyses
 * run on a tank with a failed sensor and say which sensors were left out.
 */
export function analyseTank(
  measured: readonly SeriesRow[],
  tank: TankShape & { sensorCount: number; declaredLossW: number | null },
  window: { from: Date; to: Date },
  legion: LegionellaSettings = defaultLegionella,
): TankAnalysis {
  const figures = figuresOverTime(measured, tank);
  const rows: SeriesRow[] = measured.map((r, i) => ({
    ...r,
    layersC: figures[i]?.layersC ?? r.layersC.map(() => null),
  }));
  const weights = layerThicknesses(tank.sensorHeightsM, tank.heightM);
  const declaredClass =
    tank.declaredLossW !== null ? erpClass({ volumeL: tank.volumeL, standingLossW: tank.declaredLossW }) : null;
  let standing: TankAnalysis['standingLoss'] = null;
  let note = `No quiet stretch of ${MIN_QUIET_H} h or more (no heating, no hot water drawn) in this window.`;
  for (const period of quietPeriods(rows)) {
    const hours = (period[period.length - 1]!.t - period[0]!.t) / 3_600_000;
    if (hours < MIN_QUIET_H) break;
    // One sample every 5 minutes is plenty for a curve with a time constant of days.
    const samples: CoolingSample[] = [];
    for (const r of period)
      if (samples.length === 0 || r.t - samples[samples.length - 1]!.t >= 5 * 60_000)
        samples.push({ t: r.t, meanC: columnMeanC(r.layersC as number[], tank) });
    try {
      const fit = standingLoss(samples, { volumeL: tank.volumeL, ambientC: ASSUMED_AMBIENT_C, minHours: MIN_QUIET_H });
      standing = {
        uaWPerK: fit.uaWPerK,
        lossWAt45K: fit.lossWAt45K,
        kWhPer24hAt45K: fit.kWhPer24hAt45K,
        impliedClass: erpClass({ volumeL: tank.volumeL, standingLossW: fit.lossWAt45K }),
        declaredClass,
        periodFrom: new Date(period[0]!.t).toISOString(),
        periodTo: new Date(period[period.length - 1]!.t).toISOString(),
        ambientC: ASSUMED_AMBIENT_C,
        rmsResidualK: fit.rmsResidualK,
      };
      note = `Fitted to ${hours.toFixed(1)} h without heating or draws, assuming ${ASSUMED_AMBIENT_C} °C around the cylinder.`;
      break;
    } catch (err) {
      if (!(err instanceof ThermalInputError)) throw err;
      note = `The quiet stretches in this window could not be fitted: ${err.message}`;
    }
  }
  const usable = rows.filter((r) => complete(r.layersC) && (r.layersC as number[]).length > 0);
  const sameLength = usable.filter((r) => r.layersC.length === (usable[0]?.layersC.length ?? 0));
  let legionella: TankAnalysis['legionella'] = null;
  if (sameLength.length > 0) {
    const { thresholdC, holdMin } = legion;
    const ex = legionellaExposure(
      sameLength.map((r) => ({ t: r.t, layersC: r.layersC as number[] })),
      { thresholdC, holdMin, heightsM: weights },
    );
    legionella = {
      thresholdC,
      holdMin,
      minutesAtOrAbove: ex.minutesAtOrAbove,
      longestStretchMin: ex.longestStretchMin,
      heldFraction: ex.heldFraction,
      readings: sameLength.length,
    };
  }
  const quality = windowQuality(figures.map(pointQuality));
  if (quality.status === 'withheld') note = `Not fitted: ${quality.reason}`;
  return {
    windowFrom: window.from.toISOString(),
    windowTo: window.to.toISOString(),
    standingLoss: standing,
    standingLossNote: note,
    legionella,
    quality,
  };
}
