import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useEffect, useState, type FormEvent } from 'react';
import { COLD_INLET_MAX_C, COLD_INLET_MIN_C } from '../../lib/homes/settings';
import { ApiError, fetchJson } from '../../lib/query/client';
import { withQuery } from '../../lib/query/provider';
import { ErrorNotice, Loading } from '../ui/States';

interface HomeWater { id: string; label: string; coldInletC: number | null; coldWaterC: number; coldWaterFrom: 'home' | 'EN 16147' }

/**
 * The cold water a home's figures count from: the temperature measured at its cold inlet, or
 * EN 16147's 10 °C. Admins and engineers change it; everyone else on the staff sees it.
 */
function ColdInletForm({ homeId, canChange }: { homeId: string; canChange: boolean }) {
  const client = useQueryClient();
  const key = ['home', homeId];
  const home = useQuery({ queryKey: key, queryFn: () => fetchJson<HomeWater>(`/api/homes/${homeId}`) });
  const [typed, setTyped] = useState('');
  const [fieldError, setFieldError] = useState<string | null>(null);
  const stored = home.data?.coldInletC;
  useEffect(() => { if (stored !== undefined) setTyped(stored === null ? '' : String(stored)); }, [stored]);
  const save = useMutation({
    mutationFn: (coldInletC: number | string | null) => fetchJson<{ tanksUpdated: number }>(`/api/homes/${homeId}`, { method: 'PATCH', body: JSON.stringify({ coldInletC }) }),
    onSuccess: () => client.invalidateQueries({ queryKey: key }),
    onError: (err) => setFieldError(err instanceof ApiError ? err.fields?.find((f) => f.field === 'coldInletC')?.message ?? null : null),
  });

  if (home.isPending) return <Loading label="Loading the home's cold water supply…" />;
  if (home.isError) return <ErrorNotice error={home.error} onRetry={() => home.refetch()} what="the home's cold water supply" />;
  const h = home.data;

  function submit(e: FormEvent, reset = false) {
    e.preventDefault();
    setFieldError(null);
    const text = typed.trim().replace(',', '.');
    if (reset || text === '') return save.mutate(null);
    // Sent as typed when it is not a number, so the server's message names what is wrong.
    save.mutate(Number.isFinite(Number(text)) ? Number(text) : text);
  }

  return (
    <section className="card max-w-prose" aria-labelledby="cold-water-heading">
      <h2 id="cold-water-heading" className="text-lg font-semibold">Cold water supply</h2>
      <p className="mt-1 text-sm text-ink-soft">
        Every figure of this home's cylinders (state of charge, litres at 40 °C, stored heat) counts from the cold water that refills them.
        Now: <strong>{h.coldWaterC} °C</strong> {h.coldWaterFrom === 'home' ? '(measured at this home)' : '(EN 16147’s standard 10 °C; none measured here)'}.
      </p>
      {canChange ? (
        <form className="mt-4 space-y-3" onSubmit={(e) => submit(e)} noValidate>
          <div>
            <label htmlFor="coldInletC" className="label">Measured at the cold inlet, °C</label>
            <input id="coldInletC" name="coldInletC" inputMode="decimal" className="field w-32" value={typed} onChange={(e) => setTyped(e.target.value)}
              aria-invalid={fieldError ? true : undefined} aria-describedby="coldInletC-hint coldInletC-error" />
            <p id="coldInletC-hint" className="mt-1 text-xs text-ink-soft">Between {COLD_INLET_MIN_C} and {COLD_INLET_MAX_C} °C, read at a cold tap after it has run. Leave empty for 10 °C.</p>
            {fieldError && <p id="coldInletC-error" role="alert" className="mt-1 text-sm text-brick">{fieldError}</p>}
          </div>
          {save.isError && !fieldError && <ErrorNotice error={save.error} what="the change" />}
          {save.isSuccess && <p role="status" className="text-sm">Saved. The figures of {save.data.tanksUpdated === 1 ? 'its cylinder' : `its ${save.data.tanksUpdated} cylinders`} now count from it.</p>}
          <div className="flex gap-2">
            <button type="submit" className="btn-primary" disabled={save.isPending}>{save.isPending ? 'Saving…' : 'Save'}</button>
            {h.coldInletC !== null && <button type="button" className="btn-quiet" disabled={save.isPending} onClick={(e) => submit(e, true)}>Use 10 °C again</button>}
          </div>
        </form>
      ) : (
        <p className="mt-3 text-sm text-ink-soft">An administrator or engineer can change it.</p>
      )}
    </section>
  );
}

export default withQuery(ColdInletForm);
