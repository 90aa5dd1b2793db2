import { useMutation } from '@tanstack/react-query';
import { Suspense, useState } from 'react';
import { fetchPlan, sendPlan } from '../../lib/query/energy.queries';
import type { PlanResponse } from '../../lib/tank-energy/contracts';
import { fmtMoney, planColumns } from '../../lib/tank-energy/present';
import { LazyLineChart as LineChart } from '../charts/lazy';
import { tokens } from '../charts/tokens';
import { ErrorNotice } from '../ui/States';

const clock = (ms: number) =>
  new Date(ms).toLocaleTimeString('en-GB', { hour: '2-digit', minute: '2-digit', timeZone: 'Europe/London' });

/**
 * The cheapest heating plan from now: ask for one, see price, plan and expected warm water against
 * the fixed schedule, and send it to the cylinder. `simple` is the householder's plain version.
 */
export function ChargePlanPanel({ tankId, simple = false }: { tankId: string; simple?: boolean }) {
  const [floor, setFloor] = useState(65);
  const [hours, setHours] = useState(24);
  const [plan, setPlan] = useState<PlanResponse | null>(null);
  const make = useMutation({
    mutationFn: () => fetchPlan(tankId, { comfortFloorL40: floor, hours }),
    onSuccess: setPlan,
  });
  const send = useMutation({
    mutationFn: () => sendPlan(tankId, { comfortFloorL40: floor, hours }),
    onSuccess: (r) => setPlan(r.plan),
  });

  const c = plan ? planColumns(plan) : null;
  const end = plan ? plan.startMs + plan.steps.length * plan.stepMin * 60_000 : 0;
  return (
    <section aria-labelledby={`plan-title-${tankId}`} className="card space-y-3">
      <h2 id={`plan-title-${tankId}`} className="font-semibold">
        {simple ? 'Heat when it is cheapest' : 'Charge plan'}
      </h2>
      <form
        className="flex flex-wrap items-end gap-3"
        onSubmit={(e) => {
          e.preventDefault();
          make.mutate();
        }}
      >
        <label className="label">
          {simple ? 'Always keep at least (litres of warm water)' : 'Comfort floor (V40, litres)'}
          <input
            className="field mt-1 w-28"
            type="number"
            min={0}
            max={1000}
            step={5}
            value={floor}
            onChange={(e) => setFloor(Number(e.target.value))}
          />
        </label>
        {!simple && (
          <label className="label">
            Hours ahead
            <select className="field mt-1" value={hours} onChange={(e) => setHours(Number(e.target.value))}>
              <option value={24}>24</option>
              <option value={48}>48</option>
            </select>
          </label>
        )}
        <button type="submit" className="btn-quiet" disabled={make.isPending}>
          {make.isPending ? 'Working it out…' : 'Work out a plan'}
        </button>
      </form>
      {make.isError && <ErrorNotice what="a plan" error={make.error} />}
      {plan && c && (
        <>
          <p className="text-sm" data-testid="plan-summary">
            {simple ? (
              <>
                Heating at the cheapest times should cost about <strong>{fmtMoney(plan.costPence)}</strong> over the
                next {hours} hours,{' '}
                {plan.savingsPence > 0 ? (
                  <>
                    about <strong>{fmtMoney(plan.savingsPence)}</strong> less than heating whenever the water cools.
                  </>
                ) : (
                  'about the same as heating whenever the water cools.'
                )}
              </>
            ) : (
              <>
                Plan {fmtMoney(plan.costPence)} against {fmtMoney(plan.baselineCostPence)} for the fixed thermostat;
                saving {fmtMoney(plan.savingsPence)} (allowing for heat left at the end).{' '}
                {plan.floorMet
                  ? 'Keeps V40 at or above the floor throughout.'
                  : 'Cannot keep V40 above the floor at every step: see the chart.'}
              </>
            )}
          </p>
          {plan.windows && plan.windows.length > 0 && (
            <p className="text-sm">
              {simple ? 'It would heat' : 'Windows sent as a schedule'}:{' '}
              {plan.windows.map((w) => `${w.from}–${w.to}`).join(', ')}.
            </p>
          )}
          {!simple && (
            <Suspense fallback={<p className="text-sm text-ink-muted">Drawing the plan…</p>}>
              <LineChart
                t={c.t}
                from={plan.startMs}
                to={end}
                yLabel="litres at 40 °C"
                y2Label="p/kWh"
                height={240}
                series={[
                  { label: 'Price (p/kWh)', values: c.price, colour: tokens.ochre.DEFAULT, scale: 'y2' },
                  { label: 'Expected V40, plan', values: c.v40, colour: tokens.tide.DEFAULT, width: 2 },
                  {
                    label: 'Expected V40, fixed thermostat',
                    values: c.baselineV40,
                    colour: tokens.ink.muted,
                    dash: [4, 4],
                  },
                  { label: 'Comfort floor', values: c.floor, colour: tokens.brick.DEFAULT, dash: [2, 3] },
                  { label: 'Heating', values: c.heating, colour: tokens.kiln.DEFAULT, width: 6 },
                ]}
              />
            </Suspense>
          )}
          {!simple && (
            <p className="text-xs text-ink-muted">
              From {clock(plan.startMs)}; tariff:{' '}
              {plan.tariffSource === 'home' ? 'this home’s own' : 'the company default'}.
            </p>
          )}
          <div className="flex flex-wrap items-center gap-3">
            <button
              type="button"
              className="btn-primary"
              disabled={send.isPending || plan.windows === null}
              onClick={() => send.mutate()}
            >
              {send.isPending ? 'Sending…' : simple ? 'Use this plan' : 'Send to the cylinder'}
            </button>
            {send.isSuccess && (
              <span role="status" className="text-sm">
                Sent. The cylinder will heat in these windows from now on; its own thermostat and safety controls still
                apply.
              </span>
            )}
            {plan.windows === null && (
              <span className="text-sm text-ink-soft">
                Nothing to send: the water already stored covers the expected use.
              </span>
            )}
          </div>
          {send.isError && <ErrorNotice what="the plan to your cylinder" error={send.error} />}
        </>
      )}
    </section>
  );
}
