import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useEffect } from 'react';
import { useForm } from 'react-hook-form';
import { z } from '@/lib/zod';
import { COLD_INLET_MAX_C, COLD_INLET_MIN_C, homeSettingsBody } from '../../lib/homes/settings';
import { fetchJson } from '../../lib/query/client';
import { Field, Form, Saved } from '../form/fields';
import { showServerErrors } from '../form/server-errors';
import { withQuery } from '../../lib/query/provider';
import { ErrorNotice, Loading } from '../ui/States';

/** As typed: empty is "use 10 °C"; a decimal comma is read as a point; text that is no number goes as typed, for the schema to name. */
const typedSchema = z
  .object({ coldInletC: z.string() })
  .transform(({ coldInletC }) => {
    const text = coldInletC.trim().replace(',', '.');
    return { coldInletC: text === '' ? null : Number.isFinite(Number(text)) ? Number(text) : text };
  })
  .pipe(homeSettingsBody);

interface HomeWater {
  id: string;
  label: string;
  coldInletC: number | null;
  coldWaterC: number;
  coldWaterFrom: 'home' | 'EN 16147';
}

/**
 * The cold water a home's figures count from: the temperature measured at its cold inlet, or
 * EN 16147's 10 °C. Admins and engineers change it; everyone else on the staff sees it.
 */
function ColdInletForm({ homeId, canChange }: { homeId: string; canChange: boolean }) {
  const client = useQueryClient();
  const key = ['home', homeId];
  const home = useQuery({ queryKey: key, queryFn: () => fetchJson<HomeWater>(`/api/homes/${homeId}`) });
  const form = useForm<{ coldInletC: string }, unknown, { coldInletC: number | null }>({
    defaultValues: { coldInletC: '' },
    resolver: zodResolver(typedSchema),
  });
  const stored = home.data?.coldInletC;
  useEffect(() => {
    if (stored !== undefined) form.reset({ coldInletC: stored === null ? '' : String(stored) });
  }, [stored, form]);
  const save = useMutation({
    mutationFn: (coldInletC: number | null) =>
      fetchJson<{ tanksUpdated: number }>(`/api/homes/${homeId}`, {
        method: 'PATCH',
        body: JSON.stringify({ coldInletC }),
      }),
    onSuccess: () => client.invalidateQueries({ queryKey: key }),
    onError: (err) => showServerErrors(form, err),
  });
  const send = (coldInletC: number | null) =>
    save.mutateAsync(coldInletC).then(
      () => undefined,
      () => undefined,
    );

  if (home.isPending) return <Loading label="Loading the home's cold water supply…" />;
  if (home.isError)
    return <ErrorNotice error={home.error} onRetry={() => home.refetch()} what="the home's cold water supply" />;
  const h = home.data;

  return (
    <section className="card max-w-prose" aria-labelledby="cold-water-heading">
      <h2 id="cold-water-heading" className="text-lg font-semibold">
        Cold water supply
      </h2>
      <p className="mt-1 text-sm text-ink-soft">
        Every figure of this home's cylinders (state of charge, litres at 40 °C, stored heat) counts from the cold water
        that refills them. Now: <strong>{h.coldWaterC} °C</strong>{' '}
        {h.coldWaterFrom === 'home' ? '(measured at this home)' : '(EN 16147’s standard 10 °C; none measured here)'}.
      </p>
      {canChange ? (
        <Form form={form} className="mt-4 space-y-3" onSubmit={(v) => send(v.coldInletC)}>
          <Field
            name="coldInletC"
            label="Measured at the cold inlet, °C"
            inputMode="decimal"
            className="w-32"
            hint={`Between ${COLD_INLET_MIN_C} and ${COLD_INLET_MAX_C} °C, read at a cold tap after it has run. Leave empty for 10 °C.`}
          />
          {save.isSuccess && (
            <Saved>
              Saved. The figures of{' '}
              {save.data.tanksUpdated === 1 ? 'its cylinder' : `its ${save.data.tanksUpdated} cylinders`} now count from
              it.
            </Saved>
          )}
          <div className="flex gap-2">
            <button type="submit" className="btn-primary" disabled={save.isPending}>
              {save.isPending ? 'Saving…' : 'Save'}
            </button>
            {h.coldInletC !== null && (
              <button
                type="button"
                className="btn-quiet"
                disabled={save.isPending}
                onClick={() => {
                  form.clearErrors();
                  void send(null);
                }}
              >
                Use 10 °C again
              </button>
            )}
          </div>
        </Form>
      ) : (
        <p className="mt-3 text-sm text-ink-soft">An administrator or engineer can change it.</p>
      )}
    </section>
  );
}

export default withQuery(ColdInletForm);
