// What makes a tank need a person, in the order the desk should deal with it. Pure: the fleet
// query gathers the facts, these functions decide.
import { shortCycleViolations } from '../thermal';

export const attentionKinds = ['offline', 'sensor_fault', 'legionella_risk', 'short_cycling', 'low_hot_water', 'immersion_heavy'] as const;
export type AttentionKind = (typeof attentionKinds)[number];

/** Labels the desk reads (trade terms allowed here). */
export const attentionLabels: Record<AttentionKind, string> = {
  offline: 'Not reporting',
  sensor_fault: 'Sensor fault',
  legionella_risk: 'Legionella risk',
  short_cycling: 'Heat pump short-cycling',
  low_hot_water: 'Low hot water',
  immersion_heavy: 'Immersion doing the work',
};

/** Lower is more urgent: the order in which the desk should act. */
export const attentionPriority: Record<AttentionKind, number> = Object.fromEntries(attentionKinds.map((k, i) => [k, i])) as Record<AttentionKind, number>;

/**
 * Thresholds, each with where it comes from. Companies will set their own once the alert rules
 * exist; until then these are the defaults.
 */
export const attentionThresholds = {
  /** No reading for this long: offline. Devices report about once a minute (common practice). */
  offlineAfterMin: 30,
  /** Store hot water at 60 °C or above: UK HSE HSG274 Part 2 (2014). */
  legionellaC: 60,
  /** The top of the store must hold 60 °C for at least one full hour in 7 days (common practice). */
  legionellaHoldHours: 1,
  legionellaWindowDays: 7,
  /** At most one hot-water compressor start per hour (common practice). */
  minStartGapMin: 60,
  shortCycleWindowH: 24,
  /** Below the minimum V40 that Regulation (EU) No 814/2013 sets for load profile M: 65 L. */
  lowV40L: 65,
  /** Immersion share of the electricity used for hot water over 7 days (common practice). */
  immersionShareMax: 0.3,
  /** A sensor more than this much warmer than the one above it: hot water cannot sit under cold (buoyancy; common practice). */
  inversionK: 5,
} as const;

/** Sensor problems visible in one reading: a missing value, an impossible one, or an inversion. */
export function sensorFaultIn(layersC: readonly (number | null)[]): string | null {
  for (let i = 0; i < layersC.length; i++) {
    const t = layersC[i];
    if (t === null || t === undefined || !Number.isFinite(t)) return `Sensor ${i + 1} (from the bottom) gives no reading.`;
    if (t < 0 || t > 100) return `Sensor ${i + 1} (from the bottom) reads ${t.toFixed(1)} °C, which water in a cylinder cannot be.`;
  }
  for (let i = 0; i + 1 < layersC.length; i++) {
    const below = layersC[i]!;
    const above = layersC[i + 1]!;
    if (below - above > attentionThresholds.inversionK) {
      return `Sensor ${i + 1} reads ${(below - above).toFixed(1)} K warmer than sensor ${i + 2} above it: the sensors may be swapped or misplaced.`;
    }
  }
  return null;
}

export interface AttentionFacts {
  lastSeenAt: Date | null;
  online: boolean | null;
  layersC: readonly (number | null)[] | null;
  v40L: number | null;
  hasHeatPump: boolean;
  /** Compressor starts in the short-cycle window, epoch ms, in order (plus the start before the window, if any). */
  compressorStarts: readonly number[];
  /** Whole hours in the window during which the top sensor stayed at or above the legionella temperature; null when no data. */
  topHeldHours: number | null;
  immersionWh: number;
  compressorWh: number;
}

/** The attention kinds that apply, most urgent first. */
export function attentionFor(f: AttentionFacts, now: number): AttentionKind[] {
  const th = attentionThresholds;
  const out: AttentionKind[] = [];
  const seen = f.lastSeenAt?.getTime() ?? null;
  if (f.online === false || seen === null || now - seen > th.offlineAfterMin * 60_000) out.push('offline');
  if (f.layersC && f.layersC.length > 0 && sensorFaultIn(f.layersC)) out.push('sensor_fault');
  if (f.topHeldHours !== null && f.topHeldHours < th.legionellaHoldHours) out.push('legionella_risk');
  if (f.hasHeatPump && shortCycleViolations(f.compressorStarts, { minGapMin: th.minStartGapMin }).length > 0) out.push('short_cycling');
  if (f.v40L !== null && f.v40L < th.lowV40L) out.push('low_hot_water');
  const total = f.immersionWh + f.compressorWh;
  if (f.hasHeatPump && total > 0 && f.immersionWh / total > th.immersionShareMax) out.push('immersion_heavy');
  return out;
}

/** Overall status of a tank for the table's status filter. */
export type TankStatus = 'offline' | 'attention' | 'ok';
export const tankStatuses = ['offline', 'attention', 'ok'] as const;
export function statusOf(kinds: readonly AttentionKind[]): TankStatus {
  if (kinds.includes('offline')) return 'offline';
  return kinds.length > 0 ? 'attention' : 'ok';
}
