import { useQuery } from '@tanstack/react-query';
import { energyQuery } from '../../lib/query/energy.queries';
import { fmtMoney, solarSentence } from '../../lib/tank-energy/present';
import { ChargePlanPanel } from './ChargePlanPanel';

/** The householder's cost card, in plain words, and the simple charge plan. */
export function HotWaterCost({ tankId }: { tankId: string }) {
  const energy = useQuery(energyQuery(tankId, 7));
  const e = energy.data;
  return (
    <>
      <section aria-labelledby="cost-title" className="card" data-testid="hot-water-cost">
        <h2 id="cost-title" className="font-semibold">
          What your hot water cost
        </h2>
        {energy.isPending ? (
          <p className="mt-1 text-sm text-ink-soft">Adding it up…</p>
        ) : !e ? (
          <p className="mt-1 text-sm text-ink-soft">We could not add up the cost just now.</p>
        ) : e.totals.days === 0 ? (
          <p className="mt-1 text-sm">Nothing to show yet: your cylinder has not sent enough readings this week.</p>
        ) : (
          <>
            <p className="mt-1">
              <span className="figure text-3xl font-semibold">{fmtMoney(e.totals.costPence)}</span>{' '}
              <span className="text-sm">
                over the last {e.totals.days} day{e.totals.days === 1 ? '' : 's'}
              </span>
            </p>
            <p className="mt-1 text-sm">
              That heated about {Math.round(e.totals.drawnLitres40)} litres of warm water, about{' '}
              {fmtMoney(e.totals.costPence / e.totals.days)} a day.
              {e.tariffSource === 'none'
                ? ' No tariff is set for your home yet, so this is not priced; ask your installer.'
                : ''}
            </p>
            {solarSentence(e.totals.solarHeatKWh, e.totals.days) && (
              <p className="mt-1 text-sm" data-testid="solar-sentence">
                {solarSentence(e.totals.solarHeatKWh, e.totals.days)}
              </p>
            )}
          </>
        )}
      </section>
      <ChargePlanPanel tankId={tankId} simple />
    </>
  );
}
