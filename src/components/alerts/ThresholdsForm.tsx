import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation } from '@tanstack/react-query';
import { useForm } from 'react-hook-form';
import { z } from '@/lib/zod';
import {
  type ThresholdKey,
  type Thresholds,
  thresholdChanges,
  thresholdFields,
  thresholdOverridesSchema,
} from '../../lib/alerts/thresholds';
import { alertKinds, alertLabels, alertSeverities, severityLabels } from '../../lib/alerts/types';
import { fetchJson } from '../../lib/query/client';
import { withQuery } from '../../lib/query/provider';
import { Field, Form, Saved, Select } from '../form/fields';
import { showServerErrors } from '../form/server-errors';

interface Props {
  overrides: Record<string, unknown>;
  effective: Thresholds;
}
type Typed = Record<string, unknown>;
const keys = Object.keys(thresholdFields) as ThresholdKey[];
const severityOptions = alertSeverities.map((s) => ({
  value: s,
  label: `${severityLabels[s]}${s === 'critical' ? ' (e-mailed at once)' : ' (daily digest)'}`,
}));

/** The company's alert thresholds: each field shows its default and where it comes from; only changed values are stored. */
function ThresholdsForm({ overrides, effective }: Props) {
  const form = useForm<Typed, unknown, Record<string, unknown>>({
    defaultValues: { ...Object.fromEntries(keys.map((k) => [k, String(effective[k])])), severity: effective.severity },
    // The API's own schema, on what the form would send.
    resolver: zodResolver(
      z
        .record(z.string(), z.unknown())
        .transform((v) => thresholdChanges(v, overrides))
        .pipe(thresholdOverridesSchema),
    ),
  });
  const save = useMutation({
    mutationFn: (body: Record<string, unknown>) =>
      fetchJson('/api/alerts/thresholds', { method: 'PUT', body: JSON.stringify(body) }),
    onError: (err) => showServerErrors(form, err),
  });

  return (
    <Form
      form={form}
      onSubmit={(body) => {
        save.reset();
        return save.mutateAsync(body).catch(() => undefined);
      }}
      className="space-y-6"
    >
      {alertKinds.map((kind) => (
        <fieldset key={kind} className="card space-y-3">
          <legend className="px-1 text-lg font-semibold">{alertLabels[kind]}</legend>
          <div className="max-w-xs">
            <Select name={`severity.${kind}`} label="Severity" options={severityOptions} choose={null} />
          </div>
          <div className="grid gap-3 md:grid-cols-2">
            {keys
              .filter((k) => thresholdFields[k].group === kind)
              .map((k) => {
                const t = thresholdFields[k];
                return (
                  <Field
                    key={k}
                    name={k}
                    label={t.label}
                    unit={t.unit}
                    type="number"
                    hint={`Default ${t.default} ${t.unit}: ${t.source}.`}
                  />
                );
              })}
          </div>
        </fieldset>
      ))}
      <div className="flex items-center gap-3">
        <button type="submit" className="btn-primary" disabled={save.isPending}>
          Save thresholds
        </button>
        {save.isSuccess && <Saved>Saved. The rules use them from their next evaluation.</Saved>}
      </div>
    </Form>
  );
}

export default withQuery(ThresholdsForm);
