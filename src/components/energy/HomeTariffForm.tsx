import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useState, type ReactNode } from 'react';
import type { TariffRow } from '../../db/schema/energy';
import { localDayBounds, parseTariff } from '../../lib/energy/browser';
import { ApiError, fetchJson } from '../../lib/query/client';
import { withQuery } from '../../lib/query/provider';
import { HOME_TIME_ZONE } from '../../lib/tank-energy/contracts';
import { ErrorNotice, Loading } from '../ui/States';

type FieldName = 'kind' | 'name' | 'unit' | 'import' | 'dayImport' | 'nightImport' | 'nightStart' | 'nightEnd' | 'export' | 'validFrom' | 'validTo';
type Errors = Partial<Record<FieldName | 'form', string>>;

const fieldLabels: Record<FieldName, string> = {
  kind: 'Kind', name: 'Name', unit: 'Unit', import: 'Import price', dayImport: 'Day import price', nightImport: 'Night import price',
  nightStart: 'Night from', nightEnd: 'Night until', export: 'Export price', validFrom: 'First day', validTo: 'Last day',
};

const showDay = (d: string | Date) => new Date(d).toLocaleDateString('en-GB', { day: 'numeric', month: 'short', year: 'numeric', timeZone: HOME_TIME_ZONE });
/** A tariff's dates as people say them: its end is exclusive, so the last day is the one before. */
const period = (t: Pick<TariffRow, 'validFrom' | 'validTo'>) => `from ${showDay(t.validFrom)} ${t.validTo ? `to ${showDay(new Date(new Date(t.validTo).getTime() - 1))}` : 'with no end date'}`;
const kindLabel: Record<TariffRow['kind'], string> = { flat: 'Flat', day_night: 'Day and night', half_hourly: 'Half-hourly' };
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

const inForceNow = (t: TariffRow) => new Date(t.validFrom).getTime() <= Date.now() && (t.validTo === null || new Date(t.validTo).getTime() > Date.now());

/** A number field as typed: blank is "not given", anything else must read as a number. */
const numberOrRaw = (s: string): number | string | undefined => (s.trim() === '' ? undefined : Number.isFinite(Number(s)) ? Number(s) : s);
/** A date field as the start of that day at the home. */
const dayStart = (d: string) => (d ? new Date(localDayBounds(d, HOME_TIME_ZONE).startMs).toISOString() : undefined);
/** The end of the last day a tariff applies (exclusive): the start of the next day at the home. */
const dayEnd = (d: string) => new Date(localDayBounds(d, HOME_TIME_ZONE).endMs).toISOString();

interface Form { kind: 'flat' | 'day_night'; name: string; unit: string; import: string; dayImport: string; nightImport: string; nightStart: string; nightEnd: string; export: string; validFrom: string; validTo: string }

/** The tariff JSON the API takes, from what was typed (the same zod schema checks it here and on the server). */
function tariffOf(f: Form): Record<string, unknown> {
  const common = { kind: f.kind, ...(f.name.trim() ? { name: f.name.trim() } : {}), unit: f.unit, export: numberOrRaw(f.export) ?? 0, validFrom: dayStart(f.validFrom), validTo: f.validTo ? dayEnd(f.validTo) : null };
  return f.kind === 'flat'
    ? { ...common, import: numberOrRaw(f.import) }
    : { ...common, timeZone: HOME_TIME_ZONE, dayImport: numberOrRaw(f.dayImport), nightImport: numberOrRaw(f.nightImport), nightStart: f.nightStart, nightEnd: f.nightEnd };
}

/**
 * Errors by field from the shared schema's answer or the API's (fields named "tariff.import" and so
 * on), worded for the form: the field's own name is dropped where its label stands beside it.
 */
function byField(list: readonly { field: string; message: string }[]): Errors {
  const out: Errors = {};
  for (const e of list) {
    const name = e.field.replace(/^tariff\./, '') as FieldName;
    const key: FieldName | 'form' = name in fieldLabels ? name : 'form';
    const bare = key === 'form' ? e.message : e.message.replace(new RegExp(`^${name} `), '');
    const message = bare.charAt(0).toUpperCase() + bare.slice(1);
    out[key] = out[key] ? `${out[key]} ${message}` : message;
  }
  return out;
}

function Field({ name, errors, children, hint }: { name: FieldName; errors: Errors; children: (props: { id: string; 'aria-invalid': boolean; 'aria-describedby'?: string }) => ReactNode; hint?: string }) {
  const id = `tariff-${name}`;
  const err = errors[name];
  const describedBy = [hint ? `${id}-hint` : '', err ? `${id}-error` : ''].filter(Boolean).join(' ') || undefined;
  return (
    <div className="min-w-0">
      <label htmlFor={id} className="label">{fieldLabels[name]}</label>
      {children({ id, 'aria-invalid': !!err, ...(describedBy ? { 'aria-describedby': describedBy } : {}) })}
      {hint && <p id={`${id}-hint`} className="mt-1 text-xs text-ink-muted">{hint}</p>}
      {err && <p id={`${id}-error`} className="mt-1 text-sm text-brick" data-field-error={name}>{err}</p>}
    </div>
  );
}

/** One home's own tariffs: what prices it now, and a form to add one with its validity period. */
function HomeTariffForm({ homeId, homeLabel, tankId }: { homeId: string; homeLabel: string; tankId: string | null }) {
  const qc = useQueryClient();
  const listKey = ['tariffs', 'home', homeId];
  const list = useQuery({ queryKey: listKey, queryFn: () => fetchJson<{ tariffs: TariffRow[] }>(`/api/tariffs?homeId=${homeId}`) });
  const today = new Date().toISOString().slice(0, 10);
  const [form, setForm] = useState<Form>({ kind: 'day_night', name: '', unit: 'p/kWh', import: '', dayImport: '', nightImport: '', nightStart: '00:30', nightEnd: '05:30', export: '', validFrom: today, validTo: '' });
  const [errors, setErrors] = useState<Errors>({});
  const [saved, setSaved] = useState<TariffRow | null>(null);
  const set = (k: keyof Form) => (e: { target: { value: string } }) => { setForm({ ...form, [k]: e.target.value }); setSaved(null); };

  const save = useMutation({
    mutationFn: (tariff: Record<string, unknown>) => fetchJson<{ tariff: TariffRow }>('/api/tariffs', { method: 'POST', body: JSON.stringify({ homeId, tariff }) }),
    onSuccess: (r) => { setSaved(r.tariff); setErrors({}); void qc.invalidateQueries({ queryKey: ['tariffs'] }); if (tankId) void qc.invalidateQueries({ queryKey: ['tanks', tankId] }); },
    onError: (err) => setErrors(err instanceof ApiError && err.fields?.length ? byField(err.fields) : { form: err instanceof ApiError ? err.message : 'The server could not be reached; nothing was saved. Try again.' }),
  });

  const submit = () => {
    const tariff = tariffOf(form);
    // Blank dates are named here; everything else is the shared tariff schema's check.
    const local: Errors = {};
    if (!form.validFrom) local.validFrom = 'Must be given: the first day this home is priced by this tariff.';
    if (form.validTo && form.validFrom && form.validTo < form.validFrom) local.validTo = 'Must be the first day or later.';
    const checked = parseTariff(tariff);
    const all = { ...(checked.ok ? {} : byField(checked.errors)), ...local };
    setErrors(all);
    setSaved(null);
    if (Object.keys(all).length === 0) save.mutate(tariff);
  };

  const own = (list.data?.tariffs ?? []).filter((t) => t.homeId === homeId);
  const defaults = (list.data?.tariffs ?? []).filter((t) => t.homeId === null);
  const ownNow = own.filter(inForceNow).sort((a, b) => +new Date(b.validFrom) - +new Date(a.validFrom))[0];
  const errorList = Object.entries(errors) as [FieldName | 'form', string][];
  const numberInput = (k: 'import' | 'dayImport' | 'nightImport' | 'export') => (
    <Field name={k} errors={errors}>{(p) => <input {...p} className="field" inputMode="decimal" value={form[k]} onChange={set(k)} placeholder={form.unit === '£/kWh' ? 'e.g. 0.245' : 'e.g. 24.5'} />}</Field>
  );

  return (
    <div className="space-y-4">
      <section className="card" aria-labelledby="home-tariffs">
        <h2 id="home-tariffs" className="font-semibold">What prices {homeLabel}</h2>
        {list.isPending ? <Loading label="Loading tariffs…" /> : list.isError ? <ErrorNotice what="the tariffs" error={list.error} onRetry={() => list.refetch()} /> : (
          <>
            <p className="mt-1 text-sm" data-testid="tariff-now">
              {ownNow ? <>Now: this home's own tariff <strong>{title(ownNow)}</strong> ({describe(ownNow)}).</>
                : defaults.some(inForceNow) ? <>Now: the company default tariff (this home has none of its own in force today).</>
                : <>Now: no tariff is in force for this home, so its hot water is not priced.</>}
            </p>
            <h3 className="mt-3 text-sm font-semibold">This home's own</h3>
            <ul className="mt-1 divide-y divide-line text-sm" data-testid="home-tariff-list">
              {own.map((t) => <li key={t.id} className="py-2"><strong>{title(t)}</strong> — {describe(t)} · {period(t)}{inForceNow(t) ? ' · in force now' : ''}</li>)}
              {own.length === 0 && <li className="py-2 text-ink-soft">None: the company defaults price this home.</li>}
            </ul>
            <h3 className="mt-3 text-sm font-semibold">Company defaults</h3>
            <ul className="mt-1 divide-y divide-line text-sm">
              {defaults.map((t) => <li key={t.id} className="py-2">{title(t)} — {describe(t)} · {period(t)}</li>)}
              {defaults.length === 0 && <li className="py-2 text-ink-soft">None set.</li>}
            </ul>
            <p className="mt-2 text-xs text-ink-muted">A home's own tariff overrides the company default for its dates only; before and after them the default applies. Where two of the home's own overlap, the later start wins. Costs already worked out for those days are worked out again.</p>
          </>
        )}
      </section>

      <section className="card space-y-3" aria-labelledby="home-tariff-add">
        <h2 id="home-tariff-add" className="font-semibold">Set a tariff for this home</h2>
        {errorList.length > 0 && (
          <div role="alert" className="rounded-card border border-brick bg-brick-pale p-3 text-sm" data-testid="tariff-errors">
            <p className="font-semibold">The tariff was not saved. Correct {errorList.length === 1 ? 'this' : 'these'} and save again:</p>
            <ul className="mt-1 list-disc pl-5">{errorList.map(([k, m]) => <li key={k}>{k === 'form' ? m : <a className="underline" href={`#tariff-${k}`}>{fieldLabels[k]}</a>}{k === 'form' ? null : <>: {m}</>}</li>)}</ul>
          </div>
        )}
        <form noValidate method="post" className="grid grid-cols-1 gap-3 sm:grid-cols-2 lg:grid-cols-4" onSubmit={(e) => { e.preventDefault(); submit(); }}>
          <Field name="kind" errors={errors}>{(p) => (
            <select {...p} className="field" value={form.kind} onChange={set('kind')}><option value="flat">Flat (one price)</option><option value="day_night">Day and night</option></select>
          )}</Field>
          <Field name="name" errors={errors} hint="Optional, e.g. the supplier's plan name.">{(p) => <input {...p} className="field" value={form.name} onChange={set('name')} maxLength={120} />}</Field>
          <Field name="unit" errors={errors}>{(p) => <select {...p} className="field" value={form.unit} onChange={set('unit')}><option>p/kWh</option><option>£/kWh</option></select>}</Field>
          {form.kind === 'flat' ? numberInput('import') : (
            <>
              {numberInput('dayImport')}
              {numberInput('nightImport')}
              <Field name="nightStart" errors={errors} hint="24-hour clock at the home.">{(p) => <input {...p} className="field" value={form.nightStart} onChange={set('nightStart')} placeholder="00:30" />}</Field>
              <Field name="nightEnd" errors={errors}>{(p) => <input {...p} className="field" value={form.nightEnd} onChange={set('nightEnd')} placeholder="05:30" />}</Field>
            </>
          )}
          {numberInput('export')}
          <Field name="validFrom" errors={errors} hint="From the start of this day at the home.">{(p) => <input {...p} className="field" type="date" value={form.validFrom} onChange={set('validFrom')} />}</Field>
          <Field name="validTo" errors={errors} hint="Optional: the last day it applies. Leave empty while it runs on.">{(p) => <input {...p} className="field" type="date" value={form.validTo} onChange={set('validTo')} />}</Field>
          <div className="flex items-end sm:col-span-2 lg:col-span-4">
            <button type="submit" className="btn-primary" disabled={save.isPending}>{save.isPending ? 'Saving…' : 'Save tariff for this home'}</button>
          </div>
        </form>
        {saved && <p role="status" className="text-sm" data-testid="tariff-saved">Saved: {title(saved)} prices this home {period(saved)}.</p>}
        <p className="text-xs text-ink-muted">Half-hourly prices for this home can be uploaded as CSV through <span className="figure">POST /api/tariffs?homeId={homeId}</span> (the format of the tariffs page).</p>
      </section>
      {tankId && <p className="text-sm"><a className="text-tide-deep underline" href={`/tanks/${tankId}`}>Back to the cylinder</a></p>}
    </div>
  );
}

export default withQuery(HomeTariffForm);
