// Compressor runs, immersion runs and hot-water draws, derived from one tank's readings in time
// order. Incremental: the open runs travel in a small state between batches, so the writer never
// re-reads history for readings that arrive in order. Pure: no I/O.
import type { Reading } from './wire';

export const eventKinds = ['compressor_run', 'immersion_run', 'draw'] as const;
export type EventKind = (typeof eventKinds)[number];

export interface OpenRun {
  startedAt: number;
  /** Time of the last reading that saw the run going. */
  lastTs: number;
  /** Electricity used so far, Wh. */
  energyWh: number;
  /** Hot water drawn so far, litres. */
  litres: number;
  startTopCc: number | null;
  endTopCc: number | null;
}

export interface DeriveState {
  /** Time of the newest reading seen, epoch ms; null before the first. */
  lastTs: number | null;
  open: Partial<Record<EventKind, OpenRun>>;
}

export interface EventRecord {
  kind: EventKind;
  startedAt: number;
  /** Null while the run is still going. */
  endedAt: number | null;
  energyWh: number;
  litres: number;
  startTopCc: number | null;
  endTopCc: number | null;
  /** False when a gap in the readings cut the run rather than a reading showing it stopped. */
  complete: boolean;
}

export const emptyDeriveState = (): DeriveState => ({ lastTs: null, open: {} });

/**
 * A longer silence than this closes every open run at its last reading (marked incomplete):
 * nothing can be said about what happened in between. Readings normally arrive every minute.
 */
export const MAX_GAP_MS = 15 * 60_000;
/** Below this a flow reading is meter noise or a dripping tap, not a draw (common practice). */
export const MIN_DRAW_LPM = 0.2;

function isActive(kind: EventKind, r: Reading): boolean {
  if (kind === 'compressor_run') return r.compressor === true;
  if (kind === 'immersion_run') return (r.immersionW ?? 0) > 0;
  return (r.drawLpm ?? 0) >= MIN_DRAW_LPM;
}

/** Top working sensor, centi-degrees. */
function topCc(r: Reading): number | null {
  for (let i = r.layersC.length - 1; i >= 0; i--) {
    const t = r.layersC[i];
    if (t !== null && t !== undefined) return Math.round(t * 100);
  }
  return null;
}

const toRecord = (kind: EventKind, run: OpenRun, endedAt: number | null, complete: boolean): EventRecord => ({
  kind,
  startedAt: run.startedAt,
  endedAt,
  energyWh: run.energyWh,
  litres: run.litres,
  startTopCc: run.startTopCc,
  endTopCc: run.endTopCc,
  complete,
});

/**
 * Advances `state` over `readings` (sorted by ts, all newer than state.lastTs) and returns the new
 * state and every event the readings touched: opened, extended or closed, each in its latest form
 * (keyed by kind and start, so storing them is an upsert). `state` is not modified.
 *
 * A run starts at the first reading that shows it and ends at the first that does not. Power and
 * flow in a reading are averages over the interval since the previous one, so energy and litres
 * accumulate value × interval (an interval is capped at MAX_GAP_MS).
 */
export function deriveEvents(
  state: DeriveState,
  readings: readonly Reading[],
): { state: DeriveState; events: EventRecord[] } {
  const open: Partial<Record<EventKind, OpenRun>> = {};
  for (const k of eventKinds) if (state.open[k]) open[k] = { ...state.open[k]! };
  let lastTs = state.lastTs;
  const touched = new Map<string, EventRecord>();
  const touch = (e: EventRecord) => touched.set(`${e.kind}@${e.startedAt}`, e);

  for (const r of readings) {
    if (lastTs !== null && r.ts <= lastTs) {
      throw new Error(
        `deriveEvents needs readings newer than the state (${new Date(r.ts).toISOString()} is not after ${new Date(lastTs).toISOString()}).`,
      );
    }
    const gap = lastTs === null ? null : r.ts - lastTs;
    if (gap !== null && gap > MAX_GAP_MS) {
      for (const k of eventKinds) {
        const run = open[k];
        if (run) {
          touch(toRecord(k, run, run.lastTs, false));
          delete open[k];
        }
      }
    }
    const dtH = gap === null ? 0 : Math.min(gap, MAX_GAP_MS) / 3_600_000;
    const top = topCc(r);
    for (const k of eventKinds) {
      const active = isActive(k, r);
      let run = open[k];
      if (active) {
        if (!run) {
          run = { startedAt: r.ts, lastTs: r.ts, energyWh: 0, litres: 0, startTopCc: top, endTopCc: top };
          open[k] = run;
        }
        run.lastTs = r.ts;
        run.endTopCc = top;
        if (k === 'compressor_run') run.energyWh += (r.powerW ?? 0) * dtH;
        else if (k === 'immersion_run') run.energyWh += (r.immersionW ?? 0) * dtH;
        else run.litres += (r.drawLpm ?? 0) * dtH * 60;
        touch(toRecord(k, run, null, true));
      } else if (run) {
        run.endTopCc = top ?? run.endTopCc;
        touch(toRecord(k, run, r.ts, true));
        delete open[k];
      }
    }
    lastTs = r.ts;
  }
  return { state: { lastTs, open }, events: [...touched.values()] };
}
