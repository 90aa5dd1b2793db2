import { useQuery } from '@tanstack/react-query';
import { energyQuery } from '../../lib/query/energy.queries';
import { fmtMoney } from '../../lib/tank-energy/present';
import { ErrorNotice, Loading } from '../ui/States';
import { ChargePlanPanel } from './ChargePlanPanel';

const kwh = (x: number) => x.toFixed(2);

/** Energy and cost by day for engineers (heat by source, electricity, loss, draw, DHW COP) and the charge plan. */
export function TankEnergyPanel({ tankId }: { tankId: string }) {
  const energy = useQuery(energyQuery(tankId, 7));
  return (
    <div className="space-y-4">
      <section aria-labelledby="energy-title" className="card min-w-0 overflow-x-auto">
        <h2 id="energy-title" className="font-semibold">
          Energy and cost, last 7 days
        </h2>
        {energy.isPending ? (
          <Loading label="Accounting the readings…" />
        ) : energy.isError ? (
          <ErrorNotice what="the energy figures" error={energy.error} onRetry={() => energy.refetch()} />
        ) : (
          <table className="mt-2 w-full text-right text-sm">
            <thead className="text-xs text-ink-muted">
              <tr>
                <th className="text-left">Day</th>
                <th>Heat pump kWh</th>
                <th>Immersion (grid) kWh</th>
                <th>Immersion (solar) kWh</th>
                <th>Electricity kWh</th>
                <th>Cost</th>
                <th>Loss kWh</th>
                <th>Drawn L40</th>
                <th>DHW COP</th>
              </tr>
            </thead>
            <tbody className="figure">
              {energy.data!.days.map((d) => (
                <tr key={d.date} className="border-t border-line">
                  <td className="text-left">{d.date}</td>
                  <td>{kwh(d.heatPumpHeatKWh)}</td>
                  <td>{kwh(d.immersionGridHeatKWh)}</td>
                  <td>{kwh(d.immersionSolarHeatKWh)}</td>
                  <td>{kwh(d.heatPumpElectricityKWh + d.immersionGridElectricityKWh)}</td>
                  <td>{fmtMoney(d.costPence)}</td>
                  <td>{kwh(d.standingLossKWh)}</td>
                  <td>{Math.round(d.drawnLitres40)}</td>
                  <td>{d.dhwCop === null ? '—' : d.dhwCop.toFixed(2)}</td>
                </tr>
              ))}
              {energy.data!.days.length === 0 && (
                <tr>
                  <td colSpan={9} className="py-2 text-center text-ink-soft">
                    No readings in these days.
                  </td>
                </tr>
              )}
            </tbody>
          </table>
        )}
        {energy.data && energy.data.days.length > 0 && (
          <p className="mt-2 text-sm" data-testid="solar-used">
            Solar surplus used by the immersion:{' '}
            <span className="figure">{kwh(energy.data.totals.solarHeatKWh)} kWh</span> of free heat over{' '}
            {energy.data.totals.days} day{energy.data.totals.days === 1 ? '' : 's'}
            {energy.data.totals.solarHeatKWh > 0 ? (
              <> (exported instead it would have earned about {fmtMoney(energy.data.totals.solarExportForgonePence)})</>
            ) : (
              <> (none diverted: no surplus reported, or the tank was full)</>
            )}
            .
          </p>
        )}
        {energy.data?.tariffSource === 'none' && (
          <p className="mt-2 text-sm text-ochre">
            No tariff prices this home: costs show 0. An admin can set a company default, or staff a tariff for the
            home.
          </p>
        )}
        {energy.data?.homeId && (
          <p className="mt-2 text-sm">
            Priced by{' '}
            {energy.data.tariffSource === 'home'
              ? 'this home’s own tariff where one is in force'
              : energy.data.tariffSource === 'company'
                ? 'the company default tariff'
                : 'no tariff'}
            .{' '}
            <a className="text-tide-deep underline" href={`/homes/${energy.data.homeId}/tariff`}>
              Set this home’s tariff
            </a>
          </p>
        )}
      </section>
      <ChargePlanPanel tankId={tankId} />
    </div>
  );
}
