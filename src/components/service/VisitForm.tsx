import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { type VisitFormValues, visitBody, visitFormSchema } from '../../lib/commissioning/visit-form';
import { visitKindLabels, visitKinds } from '../../lib/commissioning/visit-kinds';
import { fetchJson } from '../../lib/query/client';
import { type UploadItem, UploadPanel } from '../commissioning/UploadPanel';
import { Check, Field, Form, Select, TextArea } from '../form/fields';
import { showServerErrors } from '../form/server-errors';

export interface OpenAlert {
  id: string;
  label: string;
  summary: string;
  since: string;
}

const alertField = (id: string) => `alert-${id}`;

/** Records a service visit: findings, parts, readings, the open alerts it resolved, and photos. */
export default function VisitForm({ tankId, openAlerts = [] }: { tankId: string; openAlerts?: OpenAlert[] }) {
  const [photos, setPhotos] = useState<UploadItem[]>([]);
  const form = useForm<VisitFormValues>({
    defaultValues: { kind: 'annual_inspection', visitedAt: new Date().toISOString().slice(0, 10) },
    // Raw values go to the API, which checks them with the same schema.
    resolver: zodResolver(visitFormSchema, undefined, { raw: true }),
  });

  async function submit(values: VisitFormValues) {
    const body = visitBody(values, {
      tankId,
      resolvedAlertIds: openAlerts.filter((a) => values[alertField(a.id)] === true).map((a) => a.id),
      uploadIds: photos.map((p) => p.id),
    });
    try {
      await fetchJson('/api/visits', { method: 'POST', body: JSON.stringify(body) });
      window.location.reload();
    } catch (err) {
      showServerErrors(form, err, {
        fieldOf: (f) => f.replace(/^readings\./, ''),
        offline: 'Could not reach Heatlayer. Your notes are still here; try again.',
      });
    }
  }

  const busy = form.formState.isSubmitting;
  return (
    <Form form={form} onSubmit={submit} className="space-y-4">
      <div className="grid gap-4 sm:grid-cols-2">
        <Select
          name="kind"
          label="Kind of visit"
          options={visitKinds.map((k) => ({ value: k, label: visitKindLabels[k] }))}
        />
        <Field name="visitedAt" label="Date" type="date" />
      </div>
      <TextArea name="findings" label="Findings and work done" rows={4} />
      <TextArea name="parts" label="Parts fitted, one a line (e.g. “2 × anode”)" rows={2} />
      <div className="grid gap-4 sm:grid-cols-2">
        <Field name="topC" label="Top temperature" unit="°C" type="number" />
        <Field name="bottomC" label="Bottom temperature" unit="°C" type="number" />
        <Field name="inletPressureBar" label="Incoming pressure" unit="bar" type="number" />
        <Field name="vesselPrechargeBar" label="Expansion vessel pre-charge" unit="bar" type="number" />
      </div>
      <Check name="reliefValveTested" label="Temperature and pressure relief valve manually tested" />
      <Check name="dischargeChecked" label="Discharge pipe and tundish checked" />
      {openAlerts.length > 0 && (
        <fieldset className="space-y-2">
          <legend className="label">Open alerts this visit resolved</legend>
          {openAlerts.map((a) => (
            <Check key={a.id} name={alertField(a.id)} label={`${a.label} (since ${a.since}): ${a.summary}`} />
          ))}
        </fieldset>
      )}
      <UploadPanel target={{ tankId }} onChange={setPhotos} />
      <button type="submit" className="btn-primary w-full" disabled={busy}>
        {busy ? 'Saving…' : 'Record the visit'}
      </button>
    </Form>
  );
}
