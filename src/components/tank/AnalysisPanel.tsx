import type { TankDetail } from '../../lib/views/contracts';
import { fmtTime } from '../../lib/views/format';
import { cn } from '../ui/cn';
import { QualityNote } from '../ui/FiguresQuality';

/** Standing loss from quiet periods against the declared class, and legionella exposure per layer. */
export function AnalysisPanel({ t }: { t: TankDetail }) {
  const sl = t.analysis.standingLoss;
  const lg = t.analysis.legionella;
  const q = t.analysis.quality;
  return (
    <div className="grid gap-4 lg:grid-cols-2">
      {q.status !== 'measured' && <QualityNote q={q} className="lg:col-span-2" />}
      <section className="card" aria-labelledby="loss-title">
        <h3 id="loss-title" className="font-semibold">
          Standing loss (last 7 days)
        </h3>
        {sl ? (
          <>
            <dl className="mt-2 grid grid-cols-2 gap-2 text-sm">
              <div>
                <dt className="text-ink-muted">Loss at 45 K above ambient</dt>
                <dd className="figure text-lg">{sl.lossWAt45K.toFixed(0)} W</dd>
              </div>
              <div>
                <dt className="text-ink-muted">Per day at 45 K</dt>
                <dd className="figure text-lg">{sl.kWhPer24hAt45K.toFixed(2)} kWh</dd>
              </div>
              <div>
                <dt className="text-ink-muted">Class it implies</dt>
                <dd className="figure text-lg">{sl.impliedClass}</dd>
              </div>
              <div>
                <dt className="text-ink-muted">Declared</dt>
                <dd className="figure text-lg">
                  {sl.declaredClass ?? '—'}
                  {t.commissioning.declaredLossW !== null && (
                    <span className="text-sm text-ink-muted"> ({t.commissioning.declaredLossW} W)</span>
                  )}
                </dd>
              </div>
            </dl>
            {sl.declaredClass && sl.impliedClass !== sl.declaredClass && (
              <p
                className={cn(
                  'mt-2 rounded-md p-2 text-sm',
                  sl.impliedClass > sl.declaredClass ? 'bg-ochre-pale' : 'bg-tide-pale',
                )}
              >
                {sl.impliedClass > sl.declaredClass
                  ? 'Loses more heat than its declared class allows: check insulation, pipework and valves.'
                  : 'Loses less heat than declared.'}
              </p>
            )}
            <p className="mt-2 text-xs text-ink-muted">
              Newton cooling fit, {fmtTime(Date.parse(sl.periodFrom))} to {fmtTime(Date.parse(sl.periodTo))}, ambient
              assumed {sl.ambientC} °C, residual {sl.rmsResidualK.toFixed(2)} K. Classes per Regulation (EU) No
              812/2013.
            </p>
          </>
        ) : (
          <p className="mt-2 text-sm text-ink-soft">{t.analysis.standingLossNote}</p>
        )}
      </section>
      <section className="card" aria-labelledby="legionella-title">
        <h3 id="legionella-title" className="font-semibold">
          Legionella: time at {lg?.thresholdC ?? 60} °C or above (last 7 days)
        </h3>
        {lg ? (
          <>
            <p className="mt-1 text-sm">
              {Math.round(lg.heldFraction * 100)} % of the volume held {lg.thresholdC} °C for {lg.holdMin} min in one
              stretch.
            </p>
            <ol className="mt-2 space-y-0.5">
              {lg.minutesAtOrAbove
                .map((_, k) => lg.minutesAtOrAbove.length - 1 - k)
                .map((k) => {
                  const longest = lg.longestStretchMin[k]!;
                  const max = Math.max(lg.holdMin * 2, ...lg.longestStretchMin);
                  return (
                    <li key={k} className="grid grid-cols-[4.5rem_1fr_auto] items-center gap-2 text-xs">
                      <span className="text-ink-soft">Sensor {k + 1}</span>
                      <span className="h-2.5 rounded-sm bg-paper-sunk">
                        <span
                          className={cn('block h-full rounded-sm', longest >= lg.holdMin ? 'bg-tide' : 'bg-brick')}
                          style={{ width: `${Math.min(100, (longest / max) * 100)}%` }}
                        />
                      </span>
                      <span className="figure text-right">
                        {Math.round(lg.minutesAtOrAbove[k]!)} min, longest {Math.round(longest)}
                      </span>
                    </li>
                  );
                })}
            </ol>
            <p className="mt-2 text-xs text-ink-muted">
              Store hot water at 60 °C or above: HSE HSG274 Part 2. From {lg.readings.toLocaleString('en-GB')} readings;
              gaps over 15 min count as no evidence.
            </p>
          </>
        ) : (
          <p className="mt-2 text-sm text-ink-soft">
            {q.status === 'withheld' ? `Not counted: ${q.reason}` : 'No readings in the last 7 days.'}
          </p>
        )}
      </section>
    </div>
  );
}
