// Readings (raw or rolled up) into the columnar series the charts and the CSV read.
import { ccToC, type TankShape } from './layers';
import { figuresOverTime, type PointFigures, pointFigures, windowQuality } from './figures-over-time';
import type { ReadingsResponse, Resolution } from './contracts';

/** A raw reading or a rollup bucket, already decoded to °C. */
export interface SeriesRow {
  t: number;
  layersC: (number | null)[];
  compressor: number | null;
  immersion: number | null;
  drawLpm: number | null;
  flowC: number | null;
}

export interface RawRowCc {
  ts: Date;
  layersCc: (number | null)[];
  compressor: boolean | null;
  immersionW: number | null;
  drawDlpm: number | null;
  flowCc: number | null;
}
export interface RollupRowCc {
  bucket: Date;
  samples: number;
  layersAvgCc: (number | null)[];
  compressorSamples: number;
  immersionSamples: number;
  drawAvgLpm: number | null;
  flowAvgCc: number | null;
}

export function rawToRow(r: RawRowCc): SeriesRow {
  return {
    t: r.ts.getTime(),
    layersC: r.layersCc.map(ccToC),
    compressor: r.compressor === null ? null : r.compressor ? 1 : 0,
    immersion: r.immersionW === null ? null : r.immersionW > 0 ? 1 : 0,
    drawLpm: r.drawDlpm === null ? null : r.drawDlpm / 10,
    flowC: ccToC(r.flowCc),
  };
}

export function rollupToRow(r: RollupRowCc): SeriesRow {
  const n = Math.max(1, r.samples);
  return {
    t: r.bucket.getTime(),
    layersC: r.layersAvgCc.map(ccToC),
    compressor: r.compressorSamples / n,
    immersion: r.immersionSamples / n,
    drawLpm: r.drawAvgLpm,
    flowC: ccToC(r.flowAvgCc),
  };
}

/**
 * Columns for the charts: one array per layer and per scalar, state of charge and V40 of every
 * point from the thermal core's figures (estimated where a sensor is left out, null where withheld).
 * The figures are worked out over all of `rows` (the range), unless the caller has them already (`memoFigures`); only points from `meta.since` on (a
 * poll's cursor, default the range's start) are sent, with the quality of those points.
 * Layers beyond the tank's sensor count are dropped; missing ones are null.
 */
export function toSeries(
  rows: readonly SeriesRow[],
  tank: TankShape & { id: string; sensorCount: number; positionsM: number[] },
  meta: { from: Date; to: Date; resolution: Resolution; since?: Date },
  figures: readonly (PointFigures | null)[] = figuresOverTime(rows, tank).map(pointFigures),
): ReadingsResponse {
  const n = tank.sensorCount;
  const since = (meta.since ?? meta.from).getTime();
  const first = rows.findIndex((r) => r.t >= since);
  const start = first === -1 ? rows.length : first;
  const m = rows.length - start;
  const layers: (number | null)[][] = Array.from({ length: n }, () => new Array(m).fill(null));
  const out: ReadingsResponse = {
    tankId: tank.id,
    from: meta.from.toISOString(),
    to: meta.to.toISOString(),
    resolution: meta.resolution,
    sensorCount: n,
    positionsM: tank.positionsM,
    t: new Array(m),
    layers,
    soc: new Array(m),
    v40L: new Array(m),
    compressor: new Array(m),
    immersion: new Array(m),
    drawLpm: new Array(m),
    flowC: new Array(m),
    quality: { status: 'measured', leftOut: [], reason: null },
    qualityAt: new Array(m),
  };
  for (let i = 0; i < m; i++) {
    const r = rows[start + i]!;
    const f = figures[start + i] ?? null;
    out.t[i] = r.t;
    for (let k = 0; k < n; k++) {
      const v = r.layersC[k] ?? null;
      layers[k]![i] = v === null ? null : Math.round(v * 100) / 100;
    }
    out.soc[i] = f?.soc != null ? round(f.soc, 4) : null;
    out.v40L[i] = f?.v40L != null ? round(f.v40L, 1) : null;
    out.qualityAt[i] = f?.quality ?? null;
    out.compressor[i] = r.compressor;
    out.immersion[i] = r.immersion;
    out.drawLpm[i] = r.drawLpm;
    out.flowC[i] = r.flowC;
  }
  out.quality = windowQuality(out.qualityAt);
  return out;
}

const round = (x: number, digits: number) => Math.round(x * 10 ** digits) / 10 ** digits;

/** The reading nearest to time `t` (epoch ms) in sorted times, or -1 when there are none. */
export function nearestIndex(times: readonly number[], t: number): number {
  if (times.length === 0) return -1;
  let lo = 0;
  let hi = times.length - 1;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (times[mid]! < t) lo = mid + 1;
    else hi = mid;
  }
  if (lo > 0 && Math.abs(times[lo - 1]! - t) <= Math.abs(times[lo]! - t)) return lo - 1;
  return lo;
}

/** Every layer's value at one index, top first (how people read a column), with its height. */
export function columnAt(
  s: Pick<ReadingsResponse, 't' | 'layers' | 'positionsM'>,
  index: number,
): { layer: number; heightM: number; tempC: number | null }[] {
  const out = [];
  for (let k = s.layers.length - 1; k >= 0; k--)
    out.push({ layer: k + 1, heightM: s.positionsM[k] ?? 0, tempC: s.layers[k]![index] ?? null });
  return out;
}

/** Bounds of each heatmap cell in time: from half-way to the previous point to half-way to the next; gaps longer than `maxGapMs` stay empty. */
export function cellSpans(times: readonly number[], maxGapMs: number): { from: number; to: number }[] {
  return times.map((t, i) => {
    const prev = i > 0 ? times[i - 1]! : null;
    const next = i + 1 < times.length ? times[i + 1]! : null;
    const half = (other: number | null) =>
      other === null || Math.abs(other - t) > maxGapMs ? maxGapMs / 2 : Math.abs(other - t) / 2;
    return { from: t - half(prev), to: t + half(next) };
  });
}

/** Expected spacing of points for a resolution, ms (raw readings come about once a minute). */
export function stepMs(resolution: Resolution): number {
  return resolution === 'raw' ? 60_000 : resolution === '15m' ? 900_000 : 3_600_000;
}
