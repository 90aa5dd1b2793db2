// Helpers the rules share. Pure: no I/O.
import type { Reading } from '../../telemetry/wire';
import type { AlertEvidence } from '../types';

export const MIN = 60_000;
export const HOUR = 3_600_000;
export const DAY = 86_400_000;
/** A silence longer than this breaks any run or stretch a rule is following (as event derivation does). */
export const MAX_GAP_MS = 15 * MIN;

/** A rule's view of one moment: active (with its evidence), clear, or cannot tell (null). */
export type Finding = { active: true; evidence: AlertEvidence; since?: number } | { active: false } | { active: null };
export const clear: Finding = { active: false };
export const unknown: Finding = { active: null };

/** Layers with missing sensors filled from their neighbours (linear), for figures over the whole column; null when none work. */
export function filledLayers(layersC: readonly (number | null)[]): number[] | null {
  const known: number[] = [];
  for (let i = 0; i < layersC.length; i++) if (layersC[i] !== null && layersC[i] !== undefined) known.push(i);
  if (known.length === 0) return null;
  return layersC.map((t, i) => {
    if (t !== null && t !== undefined) return t;
    const below = [...known].reverse().find((k) => k < i);
    const above = known.find((k) => k > i);
    if (below !== undefined && above !== undefined) return layersC[below]! + ((layersC[above]! - layersC[below]!) * (i - below)) / (above - below);
    return layersC[(below ?? above)!]!;
  });
}

/** A reading as evidence: time, layers, and what was heating. */
export const sample = (r: Reading): NonNullable<AlertEvidence['readings']>[number] => ({
  ts: r.ts, layersC: [...r.layersC], ...(r.compressor !== undefined ? { compressor: r.compressor } : {}), ...(r.immersionW !== undefined ? { immersionW: r.immersionW } : {}),
});

export const round1 = (x: number) => Math.round(x * 10) / 10;
export const fmtTime = (ms: number) => new Date(ms).toISOString().slice(0, 16).replace('T', ' ') + ' UTC';
