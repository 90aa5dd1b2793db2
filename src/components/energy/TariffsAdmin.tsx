import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { emptyTariffForm, type TariffForm, tariffFormSchema, tariffOf } from '../../lib/energy/tariff-form';
import { ApiError, fetchJson } from '../../lib/query/client';
import { withQuery } from '../../lib/query/provider';
import type { TariffRow } from '../../db/schema/energy';
import { Form, Saved } from '../form/fields';
import { showServerErrors } from '../form/server-errors';
import { ErrorNotice, Loading } from '../ui/States';
import { TariffFields } from './TariffFields';

const tariffsQuery = {
  queryKey: ['tariffs', 'company'],
  queryFn: () => fetchJson<{ tariffs: TariffRow[] }>('/api/tariffs'),
};
const day = (d: string | Date | null) =>
  d
    ? new Date(d).toLocaleDateString('en-GB', {
        day: 'numeric',
        month: 'short',
        year: 'numeric',
        timeZone: 'Europe/London',
      })
    : 'open-ended';

function describe(t: TariffRow): string {
  const p = t.prices;
  if (p.kind === 'flat') return `${p.importPence.toFixed(2)} p/kWh`;
  if (p.kind === 'day_night') {
    const hm = (m: number) => `${String(Math.floor(m / 60)).padStart(2, '0')}:${String(m % 60).padStart(2, '0')}`;
    return `day ${p.dayImportPence.toFixed(2)} p/kWh, night ${hm(p.nightStartMin)}–${hm(p.nightEndMin)} ${p.nightImportPence.toFixed(2)} p/kWh`;
  }
  return `${p.importPence.length} half-hourly prices`;
}

/** Problems of a refused tariff, each naming its field or CSV line. */
function Problems({ error }: { error: unknown }) {
  if (!(error instanceof ApiError) || !error.fields?.length) return <ErrorNotice what="the tariff" error={error} />;
  return (
    <div role="alert" className="rounded-card border border-brick bg-brick-pale p-3 text-sm">
      <p className="font-semibold">{error.message}</p>
      <ul className="mt-1 list-disc pl-5">
        {error.fields.map((f, i) => (
          <li key={i}>
            <span className="figure">{f.field}</span>: {f.message}
          </li>
        ))}
      </ul>
    </div>
  );
}

/** The company's default tariffs: list, add a flat or day/night one, upload half-hourly prices. */
function TariffsAdmin() {
  const qc = useQueryClient();
  const list = useQuery(tariffsQuery);
  const form = useForm<TariffForm>({
    defaultValues: {
      ...emptyTariffForm(new Date().toISOString().slice(0, 10)),
      import: '24',
      dayImport: '27',
      nightImport: '8.5',
      export: '15',
    },
    resolver: zodResolver(tariffFormSchema, undefined, { raw: true }),
  });
  const [file, setFile] = useState<File | null>(null);
  const done = () => qc.invalidateQueries({ queryKey: ['tariffs'] });
  const add = useMutation({
    mutationFn: (tariff: Record<string, unknown>) =>
      fetchJson('/api/tariffs', { method: 'POST', body: JSON.stringify({ homeId: null, tariff }) }),
    onSuccess: done,
    onError: (err) => showServerErrors(form, err, { prefix: 'tariff.' }),
  });
  const unit = form.watch('unit');
  const upload = useMutation({
    mutationFn: async () =>
      fetchJson(`/api/tariffs?unit=${encodeURIComponent(unit)}`, {
        method: 'POST',
        headers: { accept: 'application/json', 'content-type': 'text/csv' },
        body: await file!.text(),
      }),
    onSuccess: done,
  });

  return (
    <div className="space-y-4">
      <section className="card" aria-labelledby="tariff-list">
        <h2 id="tariff-list" className="font-semibold">
          Company defaults
        </h2>
        {list.isPending ? (
          <Loading label="Loading tariffs…" />
        ) : list.isError ? (
          <ErrorNotice what="the tariffs" error={list.error} />
        ) : (
          <ul className="mt-2 divide-y divide-line text-sm">
            {list.data!.tariffs.map((t) => (
              <li key={t.id} className="py-2">
                <strong>{t.name ?? t.kind}</strong> — {describe(t)} · from {day(t.validFrom)} to {day(t.validTo)}
              </li>
            ))}
            {list.data!.tariffs.length === 0 && (
              <li className="py-2 text-ink-soft">None yet: homes without a tariff of their own are not priced.</li>
            )}
          </ul>
        )}
        <p className="mt-2 text-xs text-ink-muted">
          A home with a tariff of its own uses only that; the others use these. A newer tariff takes over from its start
          date.
        </p>
      </section>

      <section className="card space-y-3" aria-labelledby="tariff-add">
        <h2 id="tariff-add" className="font-semibold">
          Add a default tariff
        </h2>
        <Form
          form={form}
          className="grid grid-cols-1 gap-3 sm:grid-cols-2 lg:grid-cols-4"
          refusal="The tariff was not added. Correct the fields below and add it again."
          onSubmit={(v) =>
            add.mutateAsync(tariffOf(v)).then(
              () => undefined,
              () => undefined,
            )
          }
        >
          <TariffFields />
          <div className="flex items-end sm:col-span-2 lg:col-span-4">
            <button type="submit" className="btn-primary" disabled={add.isPending}>
              Add tariff
            </button>
          </div>
        </Form>
        {add.isSuccess && <Saved>Tariff added.</Saved>}
      </section>

      <section className="card space-y-3" aria-labelledby="tariff-csv">
        <h2 id="tariff-csv" className="font-semibold">
          Upload half-hourly prices
        </h2>
        <p className="text-sm text-ink-soft">
          A CSV with the header <span className="figure">start,end,import,export,unit</span>, one line per half hour,
          times with a zone (e.g. 2026-12-07T00:00:00Z); rows must follow on without gaps or overlaps. Nothing is stored
          unless every line is right. A unit column wins over the unit chosen above.
        </p>
        <div className="flex flex-wrap items-center gap-3">
          <input
            type="file"
            accept=".csv,text/csv"
            aria-label="Prices file"
            onChange={(e) => setFile(e.target.files?.[0] ?? null)}
          />
          <button
            type="button"
            className="btn-quiet"
            disabled={!file || upload.isPending}
            onClick={() => upload.mutate()}
          >
            Upload
          </button>
        </div>
        {upload.isError && <Problems error={upload.error} />}
        {upload.isSuccess && (
          <p role="status" className="text-sm">
            Prices stored.
          </p>
        )}
      </section>
    </div>
  );
}

export default withQuery(TariffsAdmin);
