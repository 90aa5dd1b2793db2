import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { lazy, Suspense, useEffect, useState } from 'react';
import { ApiError } from '../lib/query/client';
import { commandsQuery, isSettled, sendCommand, type CommandView } from '../lib/query/commands.queries';
import { withQuery } from '../lib/query/provider';
import { tankQuery } from '../lib/query/tanks.queries';
import { defaultAssumptions, everydayEquivalents, plural } from '../lib/views/everyday';
import { fmtAgo, fmtClock, fmtDuration } from '../lib/views/format';
import { householdNotices } from '../lib/views/notices';
import { householdWords } from '../lib/views/quality-words';
import { refillEstimate } from '../lib/views/refill';
import { HotWaterCost } from './energy/HotWaterCost';
import { cn } from './ui/cn';
import { ErrorNotice, Loading, OfflineBanner } from './ui/States';
import { useNow } from './ui/useOnline';

// The sizes form (react-hook-form and zod) loads when its section is opened, not with the page.
const AssumptionsForm = lazy(() => import('./homes/AssumptionsForm'));

const ASSUMPTIONS_KEY = 'heatlayer.home.assumptions.v1';
const standard = defaultAssumptions();

function useAssumptions(): [{ showerL: number; bathL: number }, (a: { showerL: number; bathL: number }) => void] {
  const [a, setA] = useState(standard);
  useEffect(() => {
    try {
      const saved = JSON.parse(localStorage.getItem(ASSUMPTIONS_KEY) ?? 'null') as {
        showerL?: number;
        bathL?: number;
      } | null;
      if (saved && saved.showerL! > 0 && saved.bathL! > 0) setA({ showerL: saved.showerL!, bathL: saved.bathL! });
    } catch {
      /* a damaged entry: keep the standard sizes */
    }
  }, []);
  return [
    a,
    (next) => {
      setA(next);
      localStorage.setItem(ASSUMPTIONS_KEY, JSON.stringify(next));
    },
  ];
}

const stateWords: Record<string, string> = {
  queued: 'Sending to your cylinder…',
  sent: 'Sent; waiting for your cylinder to answer…',
  acknowledged: 'Your cylinder has the request and is starting…',
  applied: 'Done: your cylinder is heating the water now.',
  rejected: 'Your cylinder could not do this.',
  failed: 'The request did not reach your cylinder.',
};

interface Schedule {
  windows: { from: string; to: string }[];
}

/** Hot water at home, for the householder on a phone: how much, what it means, when full, boost. */
function HomeHotWater({ tankId, initialSchedule }: { tankId: string; initialSchedule: Schedule | null }) {
  const now = useNow(10_000);
  const qc = useQueryClient();
  const tank = useQuery(tankQuery(tankId));
  const commands = useQuery(commandsQuery(tankId));
  const [assumptions, setAssumptions] = useAssumptions();
  const [editing, setEditing] = useState(false);
  const [minutes, setMinutes] = useState(60);
  const [sentId, setSentId] = useState<string | null>(null);
  const boost = useMutation({
    mutationFn: () => sendCommand(tankId, { kind: 'boost', minutes }),
    onSuccess: (c) => {
      setSentId(c.id);
      qc.invalidateQueries({ queryKey: ['tanks', tankId, 'commands'] });
    },
  });

  if (tank.isPending) return <Loading label="Checking your hot water…" />;
  if (tank.isError && !tank.data)
    return <ErrorNotice what="your hot water" error={tank.error} onRetry={() => tank.refetch()} />;
  const t = tank.data!;
  const v40 = t.figures?.v40L ?? null;
  const every = v40 !== null ? everydayEquivalents(v40, assumptions) : null;
  const refill = refillEstimate({
    toFullKWh: t.toFullKWh,
    hpOutputW: t.hpOutputW,
    immersionRatingW: t.immersionRatingW,
    compressorOn: t.latest?.compressor ?? null,
    immersionW: t.latest?.immersionW ?? null,
    now,
  });
  const notices = householdNotices(t);
  const list = commands.data ?? [];
  const mine: CommandView | undefined = sentId ? list.find((c) => c.id === sentId) : undefined;
  const pendingBoost = list.find((c) => c.kind === 'boost' && !isSettled(c.state));
  const schedule = (() => {
    const applied = list.filter((c) => c.kind === 'set_schedule' && c.state === 'applied').pop();
    const w = applied?.params.windows;
    return Array.isArray(w) ? { windows: w as Schedule['windows'] } : initialSchedule;
  })();

  return (
    <div className="mx-auto max-w-md space-y-4">
      <OfflineBanner updatedAt={tank.dataUpdatedAt} />
      <section aria-labelledby="now-title" className="card">
        <h1 id="now-title" className="text-base font-medium text-ink-soft">
          Warm water ready now
        </h1>
        {v40 === null ? (
          <p className="mt-2 text-lg" data-testid="litres-unknown">
            {(t.figures && householdWords(t.figures.quality)) ??
              'We cannot tell right now: your cylinder has not sent any readings yet.'}
          </p>
        ) : (
          <>
            <p className="mt-1">
              <span className="figure text-6xl font-semibold tracking-tight" data-testid="litres-now">
                {Math.round(v40)}
              </span>{' '}
              <span className="text-2xl">litres</span>
            </p>
            <p className="text-sm text-ink-soft">at shower temperature (40 °C), mixed with cold water at the tap</p>
            {t.figures?.quality.status === 'estimated' && (
              <p className="mt-2 rounded-md bg-ochre-pale p-2 text-sm" data-testid="litres-estimated">
                {householdWords(t.figures.quality)}
              </p>
            )}
            <p className="mt-3 text-lg" data-testid="everyday">
              That is about <strong>{plural(every!.showers, 'shower', 'showers')}</strong> or{' '}
              <strong>{plural(every!.baths, 'bath', 'baths')}</strong>.
            </p>
          </>
        )}
        <details
          className="mt-3 text-sm"
          open={editing}
          onToggle={(e) => setEditing((e.target as HTMLDetailsElement).open)}
        >
          <summary className="cursor-pointer text-dusk underline-offset-2 hover:underline">
            How we count showers and baths
          </summary>
          <p className="mt-2 text-ink-soft">
            A shower here uses {assumptions.showerL} litres of warm water and a bath {assumptions.bathL} litres. The
            standard sizes ({standard.showerL} and {standard.bathL} litres) come from the test cycles in EN 16147.
            Change them to match your home:
          </p>
          {editing && (
            <Suspense fallback={<p className="mt-2 text-ink-muted">Loading…</p>}>
              <AssumptionsForm value={assumptions} standard={standard} onSave={setAssumptions} />
            </Suspense>
          )}
        </details>
        <p className="mt-3 text-xs text-ink-muted">
          Last heard from your cylinder {fmtAgo(t.latest?.lastSeenAt, now)}.
        </p>
      </section>

      <section aria-labelledby="full-title" className="card">
        <h2 id="full-title" className="font-semibold">
          When it will be full
        </h2>
        <p className="mt-1 text-lg" data-testid="refill">
          {refill.state === 'full' ? (
            'It is full now.'
          ) : refill.state === 'heating' ? (
            <>
              Heating now: full in about {fmtDuration(refill.hours!)}, around {fmtClock(refill.readyAt!)}.
            </>
          ) : refill.state === 'waiting' ? (
            <>Not heating right now. Once it starts, filling takes about {fmtDuration(refill.hours!)}.</>
          ) : (
            'We cannot tell right now.'
          )}
        </p>
        {refill.hours !== null && refill.state !== 'full' && (
          <p className="mt-1 text-xs text-ink-muted">
            Worked out from the heat still needed and the{' '}
            {refill.source === 'heat_pump' ? 'heat pump' : 'electric heater'}’s rated output; using hot water meanwhile
            makes it longer.
          </p>
        )}
      </section>

      <section aria-labelledby="boost-title" className="card">
        <h2 id="boost-title" className="font-semibold">
          Need more hot water soon?
        </h2>
        <form
          className="mt-2 flex flex-wrap items-end gap-3"
          onSubmit={(e) => {
            e.preventDefault();
            boost.mutate();
          }}
        >
          <div>
            <label className="label" htmlFor="boost-minutes">
              Heat for
            </label>
            <select
              id="boost-minutes"
              className="field"
              value={minutes}
              onChange={(e) => setMinutes(Number(e.target.value))}
            >
              <option value={30}>30 minutes</option>
              <option value={60}>1 hour</option>
              <option value={120}>2 hours</option>
            </select>
          </div>
          <button
            type="submit"
            className="btn-primary px-6 py-3 text-base"
            disabled={boost.isPending || !!pendingBoost}
          >
            {boost.isPending ? 'Sending…' : 'Heat water now'}
          </button>
        </form>
        <div aria-live="polite" className="mt-3 text-sm" data-testid="boost-status">
          {boost.isError && (
            <p className="text-brick">
              {boost.error instanceof ApiError
                ? boost.error.message
                : 'The request could not be sent. Check your connection and try again.'}
            </p>
          )}
          {(mine ?? pendingBoost) &&
            (() => {
              const c = (mine ?? pendingBoost)!;
              return (
                <p
                  className={cn(
                    'rounded-md p-2',
                    c.state === 'applied'
                      ? 'bg-tide-pale'
                      : ['rejected', 'failed'].includes(c.state)
                        ? 'bg-brick-pale'
                        : 'bg-paper-sunk',
                  )}
                  data-state={c.state}
                >
                  {stateWords[c.state] ?? c.state}
                  {c.detail ? ` (${c.detail})` : ''}
                </p>
              );
            })()}
        </div>
      </section>

      <section aria-labelledby="schedule-title" className="card">
        <h2 id="schedule-title" className="font-semibold">
          When it heats
        </h2>
        {schedule && schedule.windows.length > 0 ? (
          <ul className="mt-1 text-sm">
            {schedule.windows.map((w, i) => (
              <li key={i}>
                From {w.from} to {w.to}
              </li>
            ))}
          </ul>
        ) : (
          <p className="mt-1 text-sm">
            Whenever the water cools down: it keeps it at about {t.targetC} °C and heats again once it drops about{' '}
            {t.hysteresisK} degrees.
          </p>
        )}
      </section>

      <HotWaterCost tankId={tankId} />

      {notices.length > 0 && (
        <section aria-labelledby="notices-title" className="card">
          <h2 id="notices-title" className="font-semibold">
            Messages about your hot water
          </h2>
          <ul className="mt-2 space-y-2">
            {notices.map((n, i) => (
              <li
                key={i}
                className={cn('rounded-md p-2 text-sm', n.tone === 'warn' ? 'bg-ochre-pale' : 'bg-paper-sunk')}
              >
                {n.text}
              </li>
            ))}
          </ul>
        </section>
      )}
      <p className="px-1 text-xs text-ink-muted">
        Water is stored hot enough to scald. If your taps run very hot, ask your installer about a mixing valve. Only a
        qualified installer should work on the cylinder or its electrics.
      </p>
    </div>
  );
}

export default withQuery(HomeHotWater);
