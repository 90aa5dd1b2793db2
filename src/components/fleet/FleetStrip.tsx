import type { FleetSummary } from '../../lib/views/contracts';
import { fmtPct } from '../../lib/views/format';

function Bars({ title, bins, labels, unit }: { title: string; bins: number[]; labels: string[]; unit: string }) {
  const max = Math.max(1, ...bins);
  return (
    <figure className="min-w-0 flex-1 basis-56">
      <figcaption className="mb-1 text-xs font-medium text-ink-soft">{title}</figcaption>
      <div
        className="flex h-14 items-end gap-0.5"
        role="img"
        aria-label={`${title}: ${bins.map((b, i) => `${labels[i]} ${unit}: ${b}`).join(', ')}`}
      >
        {bins.map((b, i) => (
          <div
            key={i}
            title={`${labels[i]} ${unit}: ${b}`}
            className="flex-1 rounded-t-sm bg-tide"
            style={{ height: `${Math.max(3, (b / max) * 100)}%` }}
          />
        ))}
      </div>
      <div className="mt-0.5 flex justify-between text-[11px] text-ink-muted">
        <span>
          {labels[0]} {unit}
        </span>
        <span>
          {labels[labels.length - 1]} {unit}
        </span>
      </div>
    </figure>
  );
}

/** The strip of fleet figures and two small distributions. */
export function FleetStrip({ s }: { s: FleetSummary }) {
  const figures: [string, string][] = [
    ['Cylinders', s.tanks.toLocaleString('en-GB')],
    ['Reporting', s.reporting.toLocaleString('en-GB')],
    ['Not reporting', s.offline.toLocaleString('en-GB')],
    ['Need attention', s.needingAttention.toLocaleString('en-GB')],
    ['Mean state of charge', fmtPct(s.meanSoc)],
    ['V40 across the fleet', `${Math.round(s.totalV40L).toLocaleString('en-GB')} L`],
    // Estimated figures count in the totals; withheld ones cannot, so the desk sees how many.
    ['Figures estimated', s.figuresQuality.estimated.toLocaleString('en-GB')],
    ['Figures withheld', s.figuresQuality.withheld.toLocaleString('en-GB')],
  ];
  return (
    <section aria-label="Fleet figures" className="card flex flex-wrap items-end gap-x-8 gap-y-4">
      <dl className="flex flex-wrap gap-x-8 gap-y-3">
        {figures.map(([k, v]) => (
          <div key={k}>
            <dt className="text-xs text-ink-muted">{k}</dt>
            <dd className="figure text-2xl" data-figure={k}>
              {v}
            </dd>
          </div>
        ))}
      </dl>
      <div className="flex min-w-0 flex-1 flex-wrap gap-6">
        <Bars
          title="State of charge, tanks per band"
          bins={s.socBins}
          labels={s.socBins.map((_, i) => `${i * 10}–${i * 10 + 10}`)}
          unit="%"
        />
        <Bars
          title="V40, tanks per band"
          bins={s.v40Bins.map((b) => b.count)}
          labels={s.v40Bins.map((b) => (b.toL === null ? `${b.fromL}+` : `${b.fromL}–${b.toL}`))}
          unit="L"
        />
      </div>
    </section>
  );
}
