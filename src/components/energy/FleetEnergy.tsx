import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { withQuery } from '../../lib/query/provider';
import { fleetEnergyQuery } from '../../lib/query/energy.queries';
import type { FleetEnergyResponse, FleetOutlier } from '../../lib/tank-energy/contracts';
import type { Fence, OutlierMetric } from '../../lib/tank-energy/fleet-outliers';
import { fmtMoney } from '../../lib/tank-energy/present';
import { Empty, ErrorNotice, Loading } from '../ui/States';

const DAY_MS = 86_400_000;
const isoDay = (ms: number) => new Date(ms).toISOString().slice(0, 10);
/** The last `n` days that have ended (yesterday back). */
const lastDays = (n: number) => ({ from: isoDay(Date.now() - n * DAY_MS), to: isoDay(Date.now() - DAY_MS) });

const metrics: Record<
  OutlierMetric,
  { title: string; unit: string; fmt: (x: number) => string; worse: 'high' | 'low'; why: string }
> = {
  cost_per_100l: {
    title: 'Cost per 100 litres of warm water',
    unit: 'p per 100 L at 40 °C',
    fmt: (x) => `${x.toFixed(1)}p`,
    worse: 'high',
    why: 'A home high here pays more than its neighbours for the same hot water: look for immersion use, a poor tariff or a heat pump that struggles. Low ones may have a meter or sensor fault. Heat-pump homes only: a cylinder heated by its immersion alone costs more per litre by design.',
  },
  dhw_cop: {
    title: 'DHW COP (heat-pump heat over its electricity)',
    unit: '',
    fmt: (x) => x.toFixed(2),
    worse: 'low',
    why: 'A low COP means the heat pump makes little heat for its electricity: short-cycling, a high flow temperature, a fouled exchanger. A very high one usually means a sensor or power reading is wrong.',
  },
};

/** Q1–Q3 as a bar between the fences, the median marked; a sketch of the spread, not a chart to read values from. */
function Spread({ f, fmt }: { f: Fence; fmt: (x: number) => string }) {
  const lo = Math.min(f.low, f.q1);
  const span = Math.max(1e-9, f.high - lo);
  const at = (x: number) => `${((x - lo) / span) * 100}%`;
  return (
    <div>
      <div
        className="relative h-6"
        role="img"
        aria-label={`Lower fence ${fmt(f.low)}, lower quartile ${fmt(f.q1)}, median ${fmt(f.median)}, upper quartile ${fmt(f.q3)}, upper fence ${fmt(f.high)}`}
      >
        <div className="absolute top-1/2 h-px w-full bg-line-strong" />
        <div
          className="absolute top-1 h-4 rounded-sm bg-tide-pale ring-1 ring-tide"
          style={{ left: at(f.q1), width: `calc(${at(f.q3)} - ${at(f.q1)})` }}
        />
        <div className="absolute top-0 h-6 w-0.5 bg-tide-deep" style={{ left: at(f.median) }} />
        <div className="absolute left-0 top-0 h-6 w-0.5 bg-ink-muted" />
        <div className="absolute right-0 top-0 h-6 w-0.5 bg-ink-muted" />
      </div>
      <div className="mt-1 flex justify-between text-xs text-ink-muted figure">
        <span>fence {fmt(f.low)}</span>
        <span>
          Q1 {fmt(f.q1)} · median {fmt(f.median)} · Q3 {fmt(f.q3)}
        </span>
        <span>fence {fmt(f.high)}</span>
      </div>
    </div>
  );
}

function OutlierSection({ metric, data }: { metric: OutlierMetric; data: FleetEnergyResponse }) {
  const m = metrics[metric];
  const f = data.fences[metric];
  const rows = data.outliers.filter((o) => o.metric === metric);
  return (
    <section className="card space-y-3" aria-labelledby={`out-${metric}`}>
      <h2 id={`out-${metric}`} className="font-semibold">
        {m.title}
      </h2>
      <p className="max-w-prose text-sm text-ink-soft">{m.why}</p>
      {!f ? (
        <Empty>
          Fewer than {data.rule.minHomes} homes have this figure over these days, so there is no fair comparison yet.
        </Empty>
      ) : (
        <>
          <Spread f={f} fmt={m.fmt} />
          <p className="text-xs text-ink-muted">{f.homes.toLocaleString('en-GB')} homes compared.</p>
          {rows.length === 0 ? (
            <p className="text-sm">No home is outside the fences.</p>
          ) : (
            <div className="overflow-x-auto">
              <table className="w-full text-sm">
                <caption className="sr-only">Homes outside the fences on {m.title.toLowerCase()}</caption>
                <thead className="text-left text-xs text-ink-muted">
                  <tr>
                    <th className="py-1 pr-3">Cylinder</th>
                    <th className="pr-3">Home</th>
                    <th className="pr-3">Town</th>
                    <th className="pr-3 text-right">{m.unit || 'Value'}</th>
                    <th className="pr-3">Side</th>
                    <th className="pr-3 text-right">Beyond fence</th>
                    <th className="text-right">Days</th>
                  </tr>
                </thead>
                <tbody>
                  {rows.map((o: FleetOutlier) => (
                    <tr key={o.tankId} className="border-t border-line">
                      <td className="py-1.5 pr-3">
                        <a
                          className="font-medium text-tide-deep underline underline-offset-2"
                          href={`/tanks/${o.tankId}`}
                        >
                          {o.serial}
                        </a>
                      </td>
                      <td className="pr-3">{o.homeReference ?? '—'}</td>
                      <td className="pr-3">{o.town ?? '—'}</td>
                      <td className="figure pr-3 text-right">{m.fmt(o.value)}</td>
                      <td className="pr-3">
                        <span className={o.side === m.worse ? 'font-medium text-brick' : 'text-ochre'}>
                          {o.side === 'high' ? 'high' : 'low'}
                          {o.side === m.worse ? ' (worse)' : ' (check readings)'}
                        </span>
                      </td>
                      <td className="figure pr-3 text-right">
                        {o.beyondIqr === null ? '—' : `${o.beyondIqr.toFixed(1)} × IQR`}
                      </td>
                      <td className="figure text-right">{o.days}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          )}
        </>
      )}
    </section>
  );
}

/** The desk's view of what hot water costs across the fleet, and the homes that stand apart. */
function FleetEnergy() {
  const [range, setRange] = useState(lastDays(30));
  const q = useQuery(fleetEnergyQuery(range.from, range.to));
  const d = q.data;
  const presets = [7, 30, 90];
  return (
    <div className="space-y-5">
      <div className="flex flex-wrap items-end gap-3">
        <h1 className="mr-auto text-2xl font-semibold tracking-tight">Fleet energy</h1>
        <div role="group" aria-label="Days" className="flex gap-1">
          {presets.map((n) => {
            const r = lastDays(n);
            const on = r.from === range.from && r.to === range.to;
            return (
              <button
                key={n}
                type="button"
                aria-pressed={on}
                className={on ? 'btn-primary' : 'btn-quiet'}
                onClick={() => setRange(r)}
              >
                Last {n} days
              </button>
            );
          })}
        </div>
        <label className="label mb-0">
          From
          <input
            className="field mt-1"
            type="date"
            value={range.from}
            max={range.to}
            onChange={(e) => e.target.value && setRange({ ...range, from: e.target.value })}
          />
        </label>
        <label className="label mb-0">
          To
          <input
            className="field mt-1"
            type="date"
            value={range.to}
            min={range.from}
            onChange={(e) => e.target.value && setRange({ ...range, to: e.target.value })}
          />
        </label>
      </div>
      <p className="max-w-prose text-sm text-ink-soft">
        Each home's hot water is accounted once its day has ended (from its readings and the tariff in force each half
        hour), so today is not included. Outliers are homes outside Tukey's fences — more than {d?.rule.k ?? 1.5}{' '}
        interquartile ranges below the lower quartile or above the upper — among homes with at least{' '}
        {d?.rule.minDays ?? 3} accounted days; cost per litre needs at least {d?.rule.minLitres40PerDay ?? 15} L a day
        drawn, COP at least {d?.rule.minHeatPumpKWhPerDay ?? 0.2} kWh a day of heat-pump electricity.
      </p>
      {q.isPending ? (
        <Loading label="Adding up the fleet's days…" />
      ) : q.isError ? (
        <ErrorNotice what="the fleet's energy figures" error={q.error} onRetry={() => q.refetch()} />
      ) : d!.homes === 0 ? (
        <Empty>
          No accounted days between {d!.from} and {d!.to}. Figures appear here the day after cylinders report.
        </Empty>
      ) : (
        <>
          <section aria-label="Fleet averages" className="card">
            <dl className="flex flex-wrap gap-x-8 gap-y-3">
              {(
                [
                  ['Homes', d!.homes.toLocaleString('en-GB')],
                  [
                    'Cost a home a day',
                    d!.averages.costPencePerHomeDay === null ? '—' : fmtMoney(d!.averages.costPencePerHomeDay),
                  ],
                  [
                    'Cost per 100 L warm water',
                    d!.averages.costPencePer100L === null ? '—' : `${d!.averages.costPencePer100L.toFixed(1)}p`,
                  ],
                  ['Fleet DHW COP', d!.averages.dhwCop === null ? '—' : d!.averages.dhwCop.toFixed(2)],
                  ['Free solar heat used', `${Math.round(d!.averages.solarHeatKWh).toLocaleString('en-GB')} kWh`],
                ] as [string, string][]
              ).map(([k, v]) => (
                <div key={k}>
                  <dt className="text-xs text-ink-muted">{k}</dt>
                  <dd className="figure text-2xl">{v}</dd>
                </div>
              ))}
            </dl>
            {d!.averages.unpricedKWh > 0.05 && (
              <p className="mt-2 text-sm text-ochre">
                {d!.averages.unpricedKWh.toFixed(1)} kWh of grid electricity fell outside every tariff's dates and is
                left out of the costs: check the tariffs.
              </p>
            )}
          </section>
          <OutlierSection metric="cost_per_100l" data={d!} />
          <OutlierSection metric="dhw_cop" data={d!} />
        </>
      )}
    </div>
  );
}

export default withQuery(FleetEnergy);
