import type { EventsResponse, TimelineKind } from '../../lib/views/contracts';
import { laneLabels, laneOrder, timelineBars } from '../../lib/views/timeline';
import { cn } from '../ui/cn';

const laneTone: Record<TimelineKind, string> = {
  compressor_run: 'bg-tide',
  immersion_run: 'bg-kiln',
  draw: 'bg-dusk',
  command: 'bg-ochre',
};

/** Lanes of runs, draws and commands over the range; short-cycle starts carry a marker. */
export function Timeline({ events, from, to, now }: { events: EventsResponse; from: number; to: number; now: number }) {
  const bars = timelineBars(events.items, from, to, now);
  const pct = (t: number) => `${((t - from) / (to - from)) * 100}%`;
  return (
    <div>
      <div className="space-y-1.5">
        {laneOrder.map((lane) => (
          <div key={lane} className="grid grid-cols-[7.5rem_1fr] items-center gap-2">
            <span className="text-xs text-ink-soft">{laneLabels[lane]}</span>
            <div className="relative h-5 rounded-sm bg-paper-sunk" role="list" aria-label={laneLabels[lane]}>
              {bars
                .filter((b) => b.kind === lane)
                .map((b, i) => (
                  <span
                    key={i}
                    role="listitem"
                    title={b.title}
                    aria-label={b.title}
                    className={cn(
                      'absolute top-0.5 bottom-0.5 rounded-sm',
                      laneTone[lane],
                      b.shortCycle && 'ring-2 ring-brick',
                    )}
                    style={{ left: pct(b.from), width: `max(2px, ${((b.to - b.from) / (to - from)) * 100}%)` }}
                  >
                    {b.shortCycle && (
                      <span
                        aria-hidden="true"
                        className="absolute -top-2 left-0 -translate-x-1/2 text-[10px] leading-none text-brick"
                      >
                        ▼
                      </span>
                    )}
                  </span>
                ))}
            </div>
          </div>
        ))}
      </div>
      <p className="mt-2 text-xs text-ink-muted">
        <span
          className="mr-1 inline-block h-2 w-3 rounded-sm bg-tide ring-2 ring-brick align-middle"
          aria-hidden="true"
        />
        {events.shortCycleStarts === 0
          ? `No short-cycle starts (a start less than ${events.minStartGapMin} min after the previous one) in this range.`
          : `${events.shortCycleStarts} short-cycle start${events.shortCycleStarts === 1 ? '' : 's'} (less than ${events.minStartGapMin} min after the previous start), marked ▼.`}
      </p>
    </div>
  );
}
