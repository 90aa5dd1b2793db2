import { useQuery } from '@tanstack/react-query';
import { Suspense, useEffect, useMemo, useState } from 'react';
import { withQuery } from '../lib/query/provider';
import { eventsQuery, exportUrl, readingsQuery, tankQuery } from '../lib/query/tanks.queries';
import { temperatureColour } from '../lib/ui/temperature-scale';
import { severityLabels } from '../lib/alerts/types';
import { fmtAgo, fmtC, fmtL, fmtPct, fmtTime } from '../lib/views/format';
import { heatSourceLabels } from '../lib/views/labels';
import { aroundEvidence, rangeBounds, rangeSearch, type RangeChoice } from '../lib/views/range';
import { LazyHeatmap as Heatmap, LazyLineChart as LineChart } from './charts/lazy';
import type { LineSeries } from './charts/LineChart';
import { TemperatureLegend } from './charts/TemperatureLegend';
import { Timeline } from './charts/Timeline';
import { tokens } from './charts/tokens';
import { AnalysisPanel } from './tank/AnalysisPanel';
import { TankEnergyPanel } from './energy/TankEnergyPanel';
import { CommissioningRecord } from './tank/CommissioningRecord';
import { LayerReadout } from './tank/LayerReadout';
import { RangePicker } from './tank/RangePicker';
import { AttentionBadge } from './ui/AttentionBadge';
import { QualityNote } from './ui/FiguresQuality';
import { Empty, ErrorNotice, Freshness, Loading, OfflineBanner } from './ui/States';
import { useNow } from './ui/useOnline';

const resolutionLabel = { raw: 'every reading', '15m': '15-minute means', '1h': 'hourly means' } as const;

const fmtStamp = (ms: number) =>
  new Date(ms).toLocaleString('en-GB', {
    day: 'numeric',
    month: 'short',
    year: 'numeric',
    hour: '2-digit',
    minute: '2-digit',
  });
/** The range shown, in the viewer's local time. */
const fmtSpan = (from: number, to: number) => `From ${fmtStamp(from)} to ${fmtStamp(to)}`;

interface Props {
  tankId: string;
  /** The range the page's link asked for (already validated on the server), or null for the default. */
  initialRange?: { from: number; to: number } | null;
  /** Why the link's range could not be used, when it could not. */
  rangeProblem?: string | null;
}

/** One tank in depth: layers over time, runs and draws, standing loss, legionella, commissioning. */
function TankView({ tankId, initialRange = null, rangeProblem = null }: Props) {
  const now = useNow(10_000);
  const [choice, setChoice] = useState<RangeChoice>(
    initialRange ? { preset: 'custom', ...initialRange } : { preset: '24h' },
  );
  const [problem, setProblem] = useState(rangeProblem);
  const bounds = rangeBounds(choice, now);
  const live = choice.preset !== 'custom';
  const tank = useQuery(tankQuery(tankId));
  const readings = useQuery(readingsQuery(tankId, bounds.from, bounds.to, live));
  const events = useQuery(eventsQuery(tankId, bounds.from, bounds.to, live));
  const [selected, setSelected] = useState(-1);
  const [follow, setFollow] = useState(true);
  const n = readings.data?.t.length ?? 0;
  useEffect(() => {
    if (follow || selected >= n) setSelected(n - 1);
  }, [n, follow, selected]);
  const pick = (i: number) => {
    setSelected(i);
    setFollow(i === n - 1);
  };
  // The address follows the range shown, so a reload or a copied link opens the same one.
  const choose = (c: RangeChoice) => {
    setChoice(c);
    setFollow(true);
    setProblem(null);
    window.history.replaceState(null, '', `${window.location.pathname}${rangeSearch(c, window.location.search)}`);
  };

  const layerSeries = useMemo<LineSeries[]>(() => {
    const s = readings.data;
    if (!s) return [];
    return s.layers.map((values, k) => ({
      label: `S${k + 1}`,
      values,
      colour: temperatureColour(10 + (60 * k) / Math.max(1, s.layers.length - 1)),
      width: k === s.layers.length - 1 || k === 0 ? 2 : 1,
    }));
  }, [readings.data]);
  const chargeSeries = useMemo<LineSeries[]>(() => {
    const s = readings.data;
    if (!s) return [];
    return [
      {
        label: 'State of charge (%)',
        values: s.soc.map((x) => (x === null ? null : x * 100)),
        colour: tokens.tide.DEFAULT,
        width: 2,
      },
      { label: 'V40 (L)', values: s.v40L, colour: tokens.kiln.DEFAULT, width: 2, scale: 'y2' },
    ];
  }, [readings.data]);

  if (tank.isPending) return <Loading label="Loading the cylinder…" />;
  if (tank.isError && !tank.data)
    return <ErrorNotice what="this cylinder" error={tank.error} onRetry={() => tank.refetch()} />;
  const t = tank.data!;
  const f = t.figures;
  const layersNow = t.latest?.layersC ?? [];

  return (
    <div className="space-y-5">
      <OfflineBanner updatedAt={tank.dataUpdatedAt} />
      <header className="flex flex-wrap items-start gap-4">
        <div className="mr-auto">
          <p className="text-sm text-ink-muted">
            <a href="/tanks" className="underline-offset-2 hover:underline">
              Cylinders
            </a>{' '}
            /
          </p>
          <h1 className="font-mono text-2xl font-semibold">{t.serial}</h1>
          <p className="text-sm text-ink-soft">
            {t.model} · {heatSourceLabels[t.heatSource]}
            {t.home ? ` · ${t.home.reference}, ${t.home.addressLine}, ${t.home.town} ${t.home.postcode}` : ''}
          </p>
        </div>
        <Freshness updatedAt={tank.dataUpdatedAt} fetching={tank.isFetching} />
      </header>

      <section aria-label="Now" className="grid gap-4 lg:grid-cols-[2fr_1fr]">
        <div className="card">
          <dl className="grid grid-cols-2 gap-3 sm:grid-cols-3 lg:grid-cols-6">
            {(
              [
                ['State of charge', fmtPct(f?.soc)],
                ['V40', fmtL(f?.v40L)],
                ['Stored heat', f?.storedKWh != null ? `${f.storedKWh.toFixed(1)} kWh` : '—'],
                ['MIX number', f?.mix != null ? f.mix.toFixed(2) : '—'],
                ['Thermocline', f?.thermoclineM != null ? `${f.thermoclineM.toFixed(2)} m` : '—'],
              ] as const
            ).map(([k, v]) => (
              <div key={k}>
                <dt className="text-xs text-ink-muted">{k}</dt>
                <dd className="text-xl" data-figure={k} data-quality={f?.quality.status ?? 'none'}>
                  {f?.quality.status === 'withheld' ? (
                    <span className="text-base text-brick">withheld</span>
                  ) : (
                    <span className="figure">{v}</span>
                  )}
                  {f?.quality.status === 'estimated' && k !== 'Thermocline' && (
                    <span className="ml-1 text-xs text-ochre">est.</span>
                  )}
                </dd>
              </div>
            ))}
            <div>
              <dt className="text-xs text-ink-muted">Last reading</dt>
              <dd className="figure text-xl" data-figure="Last reading">
                {fmtAgo(t.latest?.lastSeenAt, now)}
              </dd>
            </div>
          </dl>
          {f && <QualityNote q={f.quality} className="mt-3" />}
          <p className="mt-3 text-xs text-ink-muted">
            Heat pump {t.latest?.compressor ? 'running' : 'off'} · immersion{' '}
            {(t.latest?.immersionW ?? 0) > 0 ? `on (${t.latest?.immersionW} W)` : 'off'} · flow {fmtC(t.latest?.flowC)}{' '}
            · return {fmtC(t.latest?.returnC)} · draw {t.latest?.drawLpm ?? 0} L/min
          </p>
        </div>
        <div className="card">
          <h2 className="text-sm font-semibold">{t.attention.length ? 'Needs attention' : 'No open alerts'}</h2>
          <ul className="mt-2 space-y-3" aria-label="Open alerts">
            {t.attention.map((a) => (
              <li key={a.alertId} className="text-sm" data-alert-kind={a.kind}>
                <p>
                  <AttentionBadge kind={a.kind} /> <span className="text-ink-soft">{a.detail}</span>
                </p>
                <p className="mt-1 flex flex-wrap items-center gap-x-3 text-xs text-ink-muted">
                  <span>
                    {severityLabels[a.severity]} · since {fmtTime(Date.parse(a.openedAt))}
                    {a.state === 'acknowledged' ? ' · acknowledged' : ''}
                  </span>
                  <button
                    type="button"
                    className="underline underline-offset-2 hover:text-ink"
                    onClick={() => choose({ preset: 'custom', ...aroundEvidence(a.at) })}
                  >
                    Show on the charts
                  </button>
                </p>
              </li>
            ))}
          </ul>
          {t.attention.length > 0 && (
            <p className="mt-3 text-xs">
              <a className="text-dusk underline underline-offset-2" href="/alerts">
                Acknowledge or resolve in the alert inbox
              </a>
            </p>
          )}
        </div>
      </section>

      <section aria-labelledby="layers-title" className="card min-w-0 space-y-4">
        <div className="flex flex-wrap items-end gap-3">
          <h2 id="layers-title" className="mr-auto text-lg font-semibold">
            Layers over time
          </h2>
          <RangePicker
            key={choice.preset === 'custom' ? `${choice.from}-${choice.to}` : 'preset'}
            value={choice}
            onChange={choose}
            bounds={bounds}
          />
          <a className="btn-quiet" href={exportUrl(tankId, bounds.from, bounds.to)} download>
            Export CSV
          </a>
        </div>
        {problem && (
          <p
            role="alert"
            className="flex flex-wrap items-center gap-2 rounded border border-ochre bg-ochre-pale px-3 py-2 text-sm"
          >
            <span>{problem} Showing the last 24 hours instead.</span>
            <button
              type="button"
              className="ml-auto text-xs underline underline-offset-2"
              onClick={() => setProblem(null)}
            >
              Dismiss
            </button>
          </p>
        )}
        <p className="text-sm text-ink-soft" data-testid="range-shown">
          {fmtSpan(bounds.from, bounds.to)}
        </p>
        {readings.isPending ? (
          <Loading label="Loading readings…" />
        ) : readings.isError && !readings.data ? (
          <ErrorNotice what="the readings" error={readings.error} onRetry={() => readings.refetch()} />
        ) : readings.data && readings.data.t.length === 0 ? (
          <Empty>No readings in this range.</Empty>
        ) : readings.data ? (
          <Suspense fallback={<Loading label="Drawing the charts…" />}>
            <p className="text-xs text-ink-muted">
              {readings.data.t.length.toLocaleString('en-GB')} points, {resolutionLabel[readings.data.resolution]}
              {readings.isFetching ? ' · updating…' : ''}
            </p>
            <div className="grid gap-4 lg:grid-cols-[3fr_1fr]">
              <div className="min-w-0">
                <h3 className="sr-only">Stratification heatmap</h3>
                <Heatmap s={readings.data} heightM={t.heightM} selected={selected} onIndex={pick} />
                <TemperatureLegend />
              </div>
              <ol aria-label="Temperatures now, top first" className="min-w-0 space-y-0.5 text-sm">
                {layersNow
                  .map((_, k) => layersNow.length - 1 - k)
                  .map((k) => (
                    <li key={k} className="flex items-center gap-2">
                      <span
                        aria-hidden="true"
                        className="h-4 w-6 rounded-sm border border-line"
                        style={{ background: layersNow[k] === null ? undefined : temperatureColour(layersNow[k]!) }}
                      />
                      <span className="text-ink-soft">Sensor {k + 1}</span>
                      {f?.quality.leftOut.includes(k + 1) && (
                        <span className="text-xs text-ochre" data-left-out={k + 1}>
                          left out{f.layersC ? `, about ${fmtC(f.layersC[k])}` : ''}
                        </span>
                      )}
                      <span className="figure ml-auto">{fmtC(layersNow[k])}</span>
                    </li>
                  ))}
              </ol>
            </div>
            <LayerReadout s={readings.data} index={selected} onIndex={pick} />
            <div>
              <h3 className="mb-1 text-sm font-semibold">Each sensor (°C)</h3>
              <LineChart t={readings.data.t} from={bounds.from} to={bounds.to} series={layerSeries} yLabel="°C" />
            </div>
            <div>
              <h3 className="mb-1 text-sm font-semibold">State of charge and V40</h3>
              <QualityNote q={readings.data.quality} className="mb-2" />
              <LineChart
                t={readings.data.t}
                from={bounds.from}
                to={bounds.to}
                series={chargeSeries}
                yLabel="%"
                y2Label="L"
                yRange={[0, 100]}
                height={180}
              />
            </div>
          </Suspense>
        ) : null}
        <div>
          <h3 className="mb-2 text-sm font-semibold">Runs, draws and commands</h3>
          {events.isPending ? (
            <Loading label="Loading runs and draws…" />
          ) : events.isError && !events.data ? (
            <ErrorNotice what="the runs and draws" error={events.error} onRetry={() => events.refetch()} />
          ) : events.data ? (
            events.data.items.length === 0 ? (
              <Empty>No heat-pump runs, immersion runs, draws or commands in this range.</Empty>
            ) : (
              <Timeline events={events.data} from={bounds.from} to={bounds.to} now={now} />
            )
          ) : null}
        </div>
      </section>

      <AnalysisPanel t={t} />
      <TankEnergyPanel tankId={tankId} />
      <CommissioningRecord t={t} />
    </div>
  );
}

export default withQuery(TankView);
