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

/** A reading as evidence: time, layers, and what was heating. */
export const sample = (r: Reading): NonNullable<AlertEvidence['readings']>[number] => ({
  ts: r.ts,
  layersC: [...r.layersC],
  ...(r.compressor !== undefined ? { compressor: r.compressor } : {}),
  ...(r.immersionW !== undefined ? { immersionW: r.immersionW } : {}),
});

export const round1 = (x: number) => Math.round(x * 10) / 10;
export const fmtTime = (ms: number) => `${new Date(ms).toISOString().slice(0, 16).replace('T', ' ')} UTC`;
