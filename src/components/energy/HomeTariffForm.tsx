import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { TariffRow } from '../../db/schema/energy';
import { emptyTariffForm, type TariffForm, tariffFormSchema, tariffOf } from '../../lib/energy/tariff-form';
import { fetchJson } from '../../lib/query/client';
import { withQuery } from '../../lib/query/provider';
import { HOME_TIME_ZONE } from '../../lib/tank-energy/contracts';
import { Form, Saved } from '../form/fields';
import { showServerErrors } from '../form/server-errors';
import { ErrorNotice, Loading } from '../ui/States';
import { TariffFields } from './TariffFields';

const showDay = (d: string | Date) =>
  new Date(d).toLocaleDateString('en-GB', {
    day: 'numeric',
    month: 'short',
    year: 'numeric',
    timeZone: HOME_TIME_ZONE,
  });
/** A tariff's dates as people say them: its end is exclusive, so the last day is the one before. */
const period = (t: Pick<TariffRow, 'validFrom' | 'validTo'>) =>
  `from ${showDay(t.validFrom)} ${t.validTo ? `to ${showDay(new Date(new Date(t.validTo).getTime() - 1))}` : 'with no end date'}`;
const kindLabel: Record<TariffRow['kind'], string> = {
  flat: 'Flat',
  day_night: 'Day and night',
  half_hourly: 'Half-hourly',
};
const title = (t: TariffRow) => t.name ?? kindLabel[t.kind];

function describe(t: TariffRow): string {
  const p = t.prices;
  if (p.kind === 'flat') return `${p.importPence.toFixed(2)} p/kWh, export ${p.exportPence.toFixed(2)} p/kWh`;
  if (p.kind === 'day_night') {
    const hm = (m: number) => `${String(Math.floor(m / 60)).padStart(2, '0')}:${String(m % 60).padStart(2, '0')}`;
    return `day ${p.dayImportPence.toFixed(2)} p/kWh, night ${hm(p.nightStartMin)}–${hm(p.nightEndMin)} ${p.nightImportPence.toFixed(2)} p/kWh, export ${p.exportPence.toFixed(2)} p/kWh`;
  }
  return `${p.importPence.length} half-hourly prices`;
}

const inForceNow = (t: TariffRow) =>
  new Date(t.validFrom).getTime() <= Date.now() && (t.validTo === null || new Date(t.validTo).getTime() > Date.now());

/** One home's own tariffs: what prices it now, and a form to add one with its validity period. */
function HomeTariffForm({ homeId, homeLabel, tankId }: { homeId: string; homeLabel: string; tankId: string | null }) {
  const qc = useQueryClient();
  const listKey = ['tariffs', 'home', homeId];
  const list = useQuery({
    queryKey: listKey,
    queryFn: () => fetchJson<{ tariffs: TariffRow[] }>(`/api/tariffs?homeId=${homeId}`),
  });
  const form = useForm<TariffForm>({
    defaultValues: emptyTariffForm(new Date().toISOString().slice(0, 10)),
    resolver: zodResolver(tariffFormSchema, undefined, { raw: true }),
  });
  const [saved, setSaved] = useState<TariffRow | null>(null);
  const save = useMutation({
    mutationFn: (tariff: Record<string, unknown>) =>
      fetchJson<{ tariff: TariffRow }>('/api/tariffs', { method: 'POST', body: JSON.stringify({ homeId, tariff }) }),
    onSuccess: (r) => {
      setSaved(r.tariff);
      void qc.invalidateQueries({ queryKey: ['tariffs'] });
      if (tankId) void qc.invalidateQueries({ queryKey: ['tanks', tankId] });
    },
    // The API names fields "tariff.import" and so on.
    onError: (err) =>
      showServerErrors(form, err, {
        prefix: 'tariff.',
        offline: 'The server could not be reached; nothing was saved. Try again.',
      }),
  });

  const own = (list.data?.tariffs ?? []).filter((t) => t.homeId === homeId);
  const defaults = (list.data?.tariffs ?? []).filter((t) => t.homeId === null);
  const ownNow = own.filter(inForceNow).sort((a, b) => +new Date(b.validFrom) - +new Date(a.validFrom))[0];
  return (
    <div className="space-y-4">
      <section className="card" aria-labelledby="home-tariffs">
        <h2 id="home-tariffs" className="font-semibold">
          What prices {homeLabel}
        </h2>
        {list.isPending ? (
          <Loading label="Loading tariffs…" />
        ) : list.isError ? (
          <ErrorNotice what="the tariffs" error={list.error} onRetry={() => list.refetch()} />
        ) : (
          <>
            <p className="mt-1 text-sm" data-testid="tariff-now">
              {ownNow ? (
                <>
                  Now: this home's own tariff <strong>{title(ownNow)}</strong> ({describe(ownNow)}).
                </>
              ) : defaults.some(inForceNow) ? (
                <>Now: the company default tariff (this home has none of its own in force today).</>
              ) : (
                <>Now: no tariff is in force for this home, so its hot water is not priced.</>
              )}
            </p>
            <h3 className="mt-3 text-sm font-semibold">This home's own</h3>
            <ul className="mt-1 divide-y divide-line text-sm" data-testid="home-tariff-list">
              {own.map((t) => (
                <li key={t.id} className="py-2">
                  <strong>{title(t)}</strong> — {describe(t)} · {period(t)}
                  {inForceNow(t) ? ' · in force now' : ''}
                </li>
              ))}
              {own.length === 0 && <li className="py-2 text-ink-soft">None: the company defaults price this home.</li>}
            </ul>
            <h3 className="mt-3 text-sm font-semibold">Company defaults</h3>
            <ul className="mt-1 divide-y divide-line text-sm">
              {defaults.map((t) => (
                <li key={t.id} className="py-2">
                  {title(t)} — {describe(t)} · {period(t)}
                </li>
              ))}
              {defaults.length === 0 && <li className="py-2 text-ink-soft">None set.</li>}
            </ul>
            <p className="mt-2 text-xs text-ink-muted">
              A home's own tariff overrides the company default for its dates only; before and after them the default
              applies. Where two of the home's own overlap, the later start wins. Costs already worked out for those
              days are worked out again.
            </p>
          </>
        )}
      </section>

      <section className="card space-y-3" aria-labelledby="home-tariff-add">
        <h2 id="home-tariff-add" className="font-semibold">
          Set a tariff for this home
        </h2>
        <Form
          form={form}
          summaryTestId="tariff-errors"
          refusal="The tariff was not saved. Correct the fields below and save again."
          className="grid grid-cols-1 gap-3 sm:grid-cols-2 lg:grid-cols-4"
          onSubmit={(v) => {
            setSaved(null);
            return save.mutateAsync(tariffOf(v)).then(
              () => undefined,
              () => undefined,
            );
          }}
        >
          <TariffFields />
          <div className="flex items-end sm:col-span-2 lg:col-span-4">
            <button type="submit" className="btn-primary" disabled={save.isPending}>
              {save.isPending ? 'Saving…' : 'Save tariff for this home'}
            </button>
          </div>
        </Form>
        {saved && (
          <Saved testId="tariff-saved">
            Saved: {title(saved)} prices this home {period(saved)}.
          </Saved>
        )}
        <p className="text-xs text-ink-muted">
          Half-hourly prices for this home can be uploaded as CSV through{' '}
          <span className="figure">POST /api/tariffs?homeId={homeId}</span> (the format of the tariffs page).
        </p>
      </section>
      {tankId && (
        <p className="text-sm">
          <a className="text-tide-deep underline" href={`/tanks/${tankId}`}>
            Back to the cylinder
          </a>
        </p>
      )}
    </div>
  );
}

export default withQuery(HomeTariffForm);
