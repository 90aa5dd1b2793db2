import { useMutation } from '@tanstack/react-query';
import { useState } from 'react';
import { ApiError, fetchJson } from '../../lib/query/client';
import { withQuery } from '../../lib/query/provider';
import { thresholdFields, type ThresholdKey, type Thresholds } from '../../lib/alerts/thresholds';
import { alertKinds, alertLabels, alertSeverities, severityLabels, type AlertKind, type AlertSeverity } from '../../lib/alerts/types';

interface Props { overrides: Record<string, unknown>; effective: Thresholds }
const keys = Object.keys(thresholdFields) as ThresholdKey[];

/** The company's alert thresholds: each field shows its default and where it comes from; only changed values are stored. */
function ThresholdsForm({ overrides, effective }: Props) {
  const [values, setValues] = useState<Record<string, string>>(Object.fromEntries(keys.map((k) => [k, String(effective[k])])));
  const [severity, setSeverity] = useState<Record<AlertKind, AlertSeverity>>(effective.severity);
  const [saved, setSaved] = useState(false);
  const save = useMutation({
    mutationFn: () => {
      const body: Record<string, unknown> = {};
      for (const k of keys) if (Number(values[k]) !== thresholdFields[k].default || k in overrides) body[k] = values[k] === '' ? values[k] : Number(values[k]);
      body.severity = severity;
      return fetchJson('/api/alerts/thresholds', { method: 'PUT', body: JSON.stringify(body) });
    },
    onSuccess: () => setSaved(true),
  });
  const fieldErrors = save.error instanceof ApiError ? Object.fromEntries((save.error.fields ?? []).map((f) => [f.field, f.message])) : {};
  return (
    <form method="post" className="space-y-6" onSubmit={(e) => { e.preventDefault(); setSaved(false); save.mutate(); }}>
      {alertKinds.map((kind) => (
        <fieldset key={kind} className="card space-y-3">
          <legend className="px-1 text-lg font-semibold">{alertLabels[kind]}</legend>
          <div className="max-w-xs">
            <label className="label" htmlFor={`sev-${kind}`}>Severity</label>
            <select id={`sev-${kind}`} className="field py-1.5 text-sm" value={severity[kind]} onChange={(e) => setSeverity({ ...severity, [kind]: e.target.value as AlertSeverity })}>
              {alertSeverities.map((s) => <option key={s} value={s}>{severityLabels[s]}{s === 'critical' ? ' (e-mailed at once)' : ' (daily digest)'}</option>)}
            </select>
          </div>
          <div className="grid gap-3 md:grid-cols-2">
            {keys.filter((k) => thresholdFields[k].group === kind).map((k) => (
              <div key={k}>
                <label className="label" htmlFor={`th-${k}`}>{thresholdFields[k].label} ({thresholdFields[k].unit})</label>
                <input id={`th-${k}`} name={k} className="field figure py-1.5" inputMode="decimal" value={values[k]} aria-invalid={fieldErrors[k] ? true : undefined}
                  aria-describedby={`src-${k}`} onChange={(e) => setValues({ ...values, [k]: e.target.value })} />
                <p id={`src-${k}`} className="mt-1 text-xs text-ink-muted">Default {thresholdFields[k].default} {thresholdFields[k].unit}: {thresholdFields[k].source}.</p>
                {fieldErrors[k] && <p className="mt-1 text-sm text-brick">{fieldErrors[k]}</p>}
              </div>
            ))}
          </div>
        </fieldset>
      ))}
      <div className="flex items-center gap-3">
        <button type="submit" className="btn-primary" disabled={save.isPending}>Save thresholds</button>
        {saved && <span role="status" className="text-sm text-tide-deep">Saved. The rules use them from their next evaluation.</span>}
        {save.error && <span role="alert" className="text-sm text-brick">{save.error instanceof ApiError ? save.error.message : 'Could not save.'}</span>}
      </div>
    </form>
  );
}

export default withQuery(ThresholdsForm);
