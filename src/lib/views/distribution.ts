// Fleet distributions for the strip of small charts.

/** Counts of values 0–1 in `bins` equal bins (1 falls in the last). Nulls are left out. */
export function shareBins(values: readonly (number | null)[], bins = 10): number[] {
  const out = new Array<number>(bins).fill(0);
  for (const v of values) {
    if (v === null || !Number.isFinite(v)) continue;
    out[Math.min(bins - 1, Math.max(0, Math.floor(v * bins)))]! += 1;
  }
  return out;
}

/** Counts of litres in steps of `stepL`, the last bin open-ended from `stepL·(bins−1)`. */
export function litreBins(
  values: readonly (number | null)[],
  stepL = 50,
  bins = 6,
): { fromL: number; toL: number | null; count: number }[] {
  const out = Array.from({ length: bins }, (_, i) => ({
    fromL: i * stepL,
    toL: i === bins - 1 ? null : (i + 1) * stepL,
    count: 0,
  }));
  for (const v of values) {
    if (v === null || !Number.isFinite(v)) continue;
    out[Math.min(bins - 1, Math.max(0, Math.floor(v / stepL)))]!.count += 1;
  }
  return out;
}
