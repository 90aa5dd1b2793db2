import { useState } from 'react';
import { visitKindLabels, visitKinds } from '../../lib/commissioning/visit-kinds';
import { Check, Field, Problem, Select, type Errors, type Values } from '../commissioning/fields';
import { UploadPanel, type UploadItem } from '../commissioning/UploadPanel';

export interface OpenAlert { id: string; label: string; summary: string; since: string }

/** Records a service visit: findings, parts, readings, the open alerts it resolved, and photos. */
export default function VisitForm({ tankId, openAlerts = [] }: { tankId: string; openAlerts?: OpenAlert[] }) {
  const [values, setValues] = useState<Values>({ kind: 'annual_inspection', visitedAt: new Date().toISOString().slice(0, 10) });
  const [errors, setErrors] = useState<Errors>({});
  const [problem, setProblem] = useState<string | null>(null);
  const [photos, setPhotos] = useState<UploadItem[]>([]);
  const [busy, setBusy] = useState(false);
  const change = (name: string, value: unknown) => setValues((v) => ({ ...v, [name]: value }));
  const f = { values, errors, onChange: change };

  async function submit() {
    setBusy(true); setErrors({}); setProblem(null);
    const parts = String(values.parts ?? '').split('\n').map((l) => l.trim()).filter(Boolean).map((l) => {
      const m = l.match(/^(\d+)\s*[x×]\s*(.+)$/i);
      return m ? { quantity: Number(m[1]), name: m[2] } : { quantity: 1, name: l };
    });
    const body = {
      tankId, kind: values.kind, visitedAt: values.visitedAt, findings: values.findings ?? '', parts,
      readings: { topC: values.topC, bottomC: values.bottomC, inletPressureBar: values.inletPressureBar, vesselPrechargeBar: values.vesselPrechargeBar, reliefValveTested: values.reliefValveTested === true, dischargeChecked: values.dischargeChecked === true },
      resolvedAlertIds: openAlerts.filter((a) => values[`alert-${a.id}`] === true).map((a) => a.id),
      uploadIds: photos.map((p) => p.id),
    };
    try {
      const res = await fetch('/api/visits', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body), credentials: 'same-origin' });
      const answer = await res.json().catch(() => ({}));
      if (res.ok) { window.location.reload(); return; }
      setProblem(answer.error?.message ?? `The server answered ${res.status}.`);
      setErrors(Object.fromEntries((answer.error?.fields ?? []).map((x: { field: string; message: string }) => [x.field.replace(/^readings\./, ''), x.message])));
    } catch { setProblem('Could not reach Heatlayer. Your notes are still here; try again.'); } finally { setBusy(false); }
  }

  return (
    <form method="post" noValidate className="space-y-4" onSubmit={(e) => { e.preventDefault(); void submit(); }}>
      {problem && <Problem message={problem} />}
      <div className="grid gap-4 sm:grid-cols-2">
        <Select name="kind" label="Kind of visit" options={visitKinds.map((k) => ({ value: k, label: visitKindLabels[k] }))} {...f} />
        <Field name="visitedAt" label="Date" type="date" {...f} />
      </div>
      <div>
        <label htmlFor="f-findings" className="label">Findings and work done</label>
        <textarea id="f-findings" rows={4} className="field" value={String(values.findings ?? '')} onChange={(e) => change('findings', e.target.value)} aria-invalid={!!errors.findings} />
        {errors.findings && <p className="mt-1 text-sm text-brick">{errors.findings}</p>}
      </div>
      <div>
        <label htmlFor="f-parts" className="label">Parts fitted, one a line (e.g. “2 × anode”)</label>
        <textarea id="f-parts" rows={2} className="field" value={String(values.parts ?? '')} onChange={(e) => change('parts', e.target.value)} />
      </div>
      <div className="grid gap-4 sm:grid-cols-2">
        <Field name="topC" label="Top temperature" unit="°C" type="number" {...f} />
        <Field name="bottomC" label="Bottom temperature" unit="°C" type="number" {...f} />
        <Field name="inletPressureBar" label="Incoming pressure" unit="bar" type="number" {...f} />
        <Field name="vesselPrechargeBar" label="Expansion vessel pre-charge" unit="bar" type="number" {...f} />
      </div>
      <Check name="reliefValveTested" label="Temperature and pressure relief valve manually tested" {...f} />
      <Check name="dischargeChecked" label="Discharge pipe and tundish checked" {...f} />
      {openAlerts.length > 0 && (
        <fieldset className="space-y-2">
          <legend className="label">Open alerts this visit resolved</legend>
          {openAlerts.map((a) => <Check key={a.id} name={`alert-${a.id}`} label={`${a.label} (since ${a.since}): ${a.summary}`} {...f} />)}
        </fieldset>
      )}
      <UploadPanel target={{ tankId }} onChange={setPhotos} />
      <button type="submit" className="btn-primary w-full" disabled={busy}>{busy ? 'Saving…' : 'Record the visit'}</button>
    </form>
  );
}
