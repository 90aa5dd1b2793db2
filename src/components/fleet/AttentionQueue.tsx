import { attentionKinds, attentionLabels } from '../../lib/views/attention';
import type { FleetSummary } from '../../lib/views/contracts';
import { fmtAgo, fmtL } from '../../lib/views/format';
import { AttentionBadge } from '../ui/AttentionBadge';
import { QualifiedFigure } from '../ui/FiguresQuality';
import { Empty } from '../ui/States';

/** The tanks to deal with first, most urgent problem first, and counts per problem. */
export function AttentionQueue({ s, now }: { s: FleetSummary; now: number }) {
  return (
    <section aria-labelledby="queue-title" className="card">
      <h2 id="queue-title" className="text-lg font-semibold">
        Deal with these first
      </h2>
      <ul className="mt-2 flex flex-wrap gap-2 text-sm" aria-label="Counts per problem">
        {attentionKinds.map((k) => (
          <li key={k}>
            <a
              className="inline-flex items-center gap-1 rounded border border-line px-2 py-1 hover:bg-paper-sunk"
              href={`?alert=${k}`}
            >
              {attentionLabels[k]} <span className="figure font-semibold">{s.byAttention[k]}</span>
            </a>
          </li>
        ))}
      </ul>
      {s.queue.length === 0 ? (
        <div className="mt-3">
          <Empty>Nothing needs attention right now.</Empty>
        </div>
      ) : (
        <ol className="mt-3 divide-y divide-line">
          {s.queue.map((t, i) => (
            <li key={t.id} className="flex flex-wrap items-center gap-x-4 gap-y-1 py-2">
              <span className="figure w-6 text-ink-muted">{i + 1}</span>
              <a href={`/tanks/${t.id}`} className="font-mono font-medium text-dusk underline-offset-2 hover:underline">
                {t.serial}
              </a>
              <span className="text-sm text-ink-soft">
                {t.home ? `${t.home.reference}, ${t.home.town}` : 'No home'}
              </span>
              <span className="flex flex-wrap gap-1">
                {t.attention.map((k) => (
                  <AttentionBadge key={k} kind={k} />
                ))}
              </span>
              <span className="ml-auto text-xs text-ink-muted" data-tank={t.serial}>
                V40 <QualifiedFigure value={fmtL(t.v40L)} q={t.quality} testId="queue-v40" /> · last reading{' '}
                {fmtAgo(t.lastSeenAt, now)}
              </span>
            </li>
          ))}
        </ol>
      )}
    </section>
  );
}
