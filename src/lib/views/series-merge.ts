// The tank page's live window kept up to date from small polls: each poll asks the readings API for
// the points from the window's newest one on (same resolution), and this merges them in. The newest
// point is asked for again because a rollup bucket still filling changes until it closes.
import type { ReadingsResponse } from './contracts';
import { windowQuality } from './figures-over-time';

/** `prev`'s points in [from, next's first point) followed by all of `next`'s; quality worked out again. */
export function mergeSeries(prev: ReadingsResponse, next: ReadingsResponse, from: number): ReadingsResponse {
  const cursor = next.t[0] ?? Number.POSITIVE_INFINITY;
  let start = 0;
  while (start < prev.t.length && prev.t[start]! < from) start++;
  let end = start;
  while (end < prev.t.length && prev.t[end]! < cursor) end++;
  const join = <T>(a: readonly T[], b: readonly T[]): T[] => a.slice(start, end).concat(b);
  const qualityAt = join(prev.qualityAt, next.qualityAt);
  return {
    ...next,
    from: new Date(from).toISOString(),
    t: join(prev.t, next.t),
    layers: next.layers.map((col, k) =>
      join<number | null>(prev.layers[k] ?? new Array<null>(prev.t.length).fill(null), col),
    ),
    soc: join<number | null>(prev.soc, next.soc),
    v40L: join<number | null>(prev.v40L, next.v40L),
    compressor: join<number | null>(prev.compressor, next.compressor),
    immersion: join<number | null>(prev.immersion, next.immersion),
    drawLpm: join<number | null>(prev.drawLpm, next.drawLpm),
    flowC: join<number | null>(prev.flowC, next.flowC),
    qualityAt,
    quality: windowQuality(qualityAt),
  };
}
