// Compressor and immersion runs, draws and commands as lanes of a timeline.
import { shortCycleViolations } from '../thermal';
import type { TimelineEvent, TimelineKind } from './contracts';

export interface EventRow {
  kind: 'compressor_run' | 'immersion_run' | 'draw';
  startedAt: Date;
  endedAt: Date | null;
  energyWh: number;
  litres: number;
  complete: boolean;
}

/**
 * Marks compressor runs whose start follows the previous start sooner than `minGapMin`
 * (the thermal core's short-cycle rule). `before` is the last start before the range, if any, so
 * that the first run in range is judged too.
 */
export function markShortCycles(rows: readonly EventRow[], minGapMin: number, before: Date | null): TimelineEvent[] {
  const runs = rows
    .filter((r) => r.kind === 'compressor_run')
    .sort((a, b) => a.startedAt.getTime() - b.startedAt.getTime());
  const starts = [
    ...(before ? [{ start: before.getTime(), row: null }] : []),
    ...runs.map((r) => ({ start: r.startedAt.getTime(), row: r })),
  ];
  const flagged = new Set(shortCycleViolations(starts, { minGapMin }).map((s) => s.row));
  return rows.map((r) => ({
    kind: r.kind,
    startedAt: r.startedAt.toISOString(),
    endedAt: r.endedAt ? r.endedAt.toISOString() : null,
    energyWh: r.energyWh,
    litres: r.kind === 'draw' ? r.litres : null,
    complete: r.complete,
    shortCycle: flagged.has(r),
  }));
}

export const laneOrder: readonly TimelineKind[] = ['compressor_run', 'immersion_run', 'draw', 'command'];
export const laneLabels: Record<TimelineKind, string> = {
  compressor_run: 'Heat pump',
  immersion_run: 'Immersion',
  draw: 'Hot water drawn',
  command: 'Commands',
};

export interface LaneBar {
  kind: TimelineKind;
  from: number;
  to: number;
  shortCycle: boolean;
  title: string;
}

/** Bars per lane clipped to [from, to]; an open run ends at `now`, a command is a short mark. */
export function timelineBars(items: readonly TimelineEvent[], from: number, to: number, now: number): LaneBar[] {
  const out: LaneBar[] = [];
  for (const e of items) {
    const start = Date.parse(e.startedAt);
    const end = e.endedAt ? Date.parse(e.endedAt) : e.kind === 'command' ? start : Math.min(now, to);
    if (end < from || start > to) continue;
    out.push({
      kind: e.kind,
      from: Math.max(from, start),
      to: Math.min(to, Math.max(end, start)),
      shortCycle: e.shortCycle,
      title: describeEvent(e),
    });
  }
  return out;
}

function describeEvent(e: TimelineEvent): string {
  const at = new Date(e.startedAt);
  const mins = e.endedAt ? Math.round((Date.parse(e.endedAt) - at.getTime()) / 60000) : null;
  const time = at.toISOString().slice(11, 16);
  switch (e.kind) {
    case 'compressor_run':
      return `Heat pump run from ${time} UTC${mins !== null ? `, ${mins} min` : ', still running'}${e.energyWh ? `, ${(e.energyWh / 1000).toFixed(2)} kWh` : ''}${e.shortCycle ? ' (short-cycle start)' : ''}`;
    case 'immersion_run':
      return `Immersion on from ${time} UTC${mins !== null ? `, ${mins} min` : ', still on'}${e.energyWh ? `, ${(e.energyWh / 1000).toFixed(2)} kWh` : ''}`;
    case 'draw':
      return `Hot water drawn at ${time} UTC${e.litres ? `, ${e.litres.toFixed(0)} L` : ''}`;
    case 'command':
      return `Command ${e.command?.kind ?? ''} at ${time} UTC: ${e.command?.state ?? ''}`;
  }
}
