// The engineer's commissioning wizard: one step at a time, saved as a draft at every step so it
// can be left and resumed (on another device too); the server validates every save.
import { useQuery } from '@tanstack/react-query';
import { useEffect, useState } from 'react';
import { useForm } from 'react-hook-form';
import {
  LEGIONELLA_GUIDANCE,
  SCALD_CAUTION,
  UNVENTED_CAUTION,
  ELECTRICAL_CAUTION,
} from '../../lib/commissioning/cautions';
import { hasHeatPump, heatSourceDescriptions, heatSourceKinds, isHeatSource } from '../../lib/heat-sources';
import {
  exchangerLabels,
  exchangers,
  LEGIONELLA_STORE_C,
  safetyItems,
  stepIds,
  stepTitles,
  type StepId,
} from '../../lib/commissioning/steps';
import { fetchJson } from '../../lib/query/client';
import { withQuery } from '../../lib/query/provider';
import { ConnectionCheck } from './ConnectionCheck';
import { Check, Field, Form, Select } from '../form/fields';
import { showServerErrors } from '../form/server-errors';
import { Caution } from '../ui/States';
import { SerialScanner } from './SerialScanner';
import { ThermistorPanel } from './ThermistorPanel';
import { UploadPanel, type UploadItem } from './UploadPanel';

type Values = Record<string, unknown>;
interface HeatPumpModel {
  id: string;
  name: string;
  outputW: number;
  ntcR25Ohm: number;
  ntcBetaK: number;
}
interface Props {
  id: string;
  step: StepId;
  data: Record<string, Values>;
  uploads: UploadItem[];
  registered: boolean;
  received: boolean;
}

/** Fills in what a new draft can take from an earlier step (the householder's address for the invitation). */
function defaults(step: StepId, data: Record<string, Values>): Values {
  if (step === 'target') return { targetC: LEGIONELLA_STORE_C, hysteresisK: 5 };
  if (step === 'signoff') return { householderEmail: data.home?.contactEmail ?? '' };
  if (step === 'controls') return { externalControl: '' };
  return {};
}

function Wizard(props: Props) {
  const [step, setStep] = useState<StepId>(props.step);
  const [data, setData] = useState<Record<string, Values>>(props.data);
  const form = useForm<Values>({ defaultValues: { ...defaults(props.step, props.data), ...props.data[props.step] } });
  const values = form.watch();
  const [received, setReceived] = useState(props.received);
  const [signed, setSigned] = useState<{ pdf: string } | null>(null);
  const [uploads, setUploads] = useState<UploadItem[]>(props.uploads);

  // On a phone the step list scrolls sideways: keep the current step in view.
  // biome-ignore lint/correctness/useExhaustiveDependencies: runs when the step changes, to scroll the new step into view
  useEffect(() => {
    document.querySelector('[aria-current="step"]')?.scrollIntoView({ block: 'nearest', inline: 'center' });
  }, [step]);
  const open = (to: StepId, from: Record<string, Values>) => {
    setStep(to);
    form.reset({ ...defaults(to, from), ...from[to] });
    window.scrollTo?.(0, 0);
  };
  const go = (to: StepId) => open(to, data);

  // Each step is checked by the server, which also sees the earlier steps (a coil source needs a coil cylinder).
  async function submit(v: Values) {
    try {
      const r = await fetchJson<{ step: StepId; data: Record<string, Values> }>(`/api/commissioning/${props.id}`, {
        method: 'PATCH',
        body: JSON.stringify({ step, values: v }),
      });
      setData(r.data);
      if (step === 'signoff') {
        setSigned(
          await fetchJson<{ pdf: string }>(`/api/commissioning/${props.id}/sign-off`, { method: 'POST', body: '{}' }),
        );
        return;
      }
      const next = stepIds[stepIds.indexOf(step) + 1];
      if (next) open(next, r.data);
    } catch (err) {
      showServerErrors(form, err, { prefix: `${step}.` });
    }
  }

  const models = useQuery({
    queryKey: ['heat-pump-models'],
    queryFn: () => fetchJson<{ models: HeatPumpModel[] }>('/api/commissioning/heat-pump-models'),
    enabled: step === 'heat_source',
  });
  // A model chosen from the company's list brings its output and sensor curve with it.
  const modelId = values.heatPumpModelId;
  useEffect(() => {
    if (!modelId) return;
    const m = models.data?.models.find((x) => x.id === modelId);
    if (!m) return form.setValue('heatPumpName', '');
    for (const [k, v] of Object.entries({
      ntcR25Ohm: m.ntcR25Ohm,
      ntcBetaK: m.ntcBetaK,
      hpOutputW: m.outputW,
      heatPumpName: m.name,
    }))
      form.setValue(k, v);
  }, [modelId, models.data, form]);
  const busy = form.formState.isSubmitting;
  const index = stepIds.indexOf(step);

  if (signed) {
    return (
      <div className="card space-y-3" role="status" data-signed="true">
        <h2 className="text-xl font-semibold">Signed off and handed over</h2>
        <p>
          The record is locked. The householder has been e-mailed an invitation to Heatlayer and the commissioning
          record.
        </p>
        <p className="flex flex-wrap gap-2">
          <a className="btn-primary" href={signed.pdf}>
            Open the commissioning record (PDF)
          </a>
          <a className="btn-quiet" href={`/commissioning/${props.id}`}>
            View the record
          </a>
        </p>
      </div>
    );
  }

  return (
    <div className="grid gap-6 lg:grid-cols-[16rem_minmax(0,1fr)]">
      <nav aria-label="Commissioning steps" className="min-w-0">
        <ol className="flex gap-1 overflow-x-auto text-sm lg:flex-col">
          {stepIds.map((s, i) => (
            <li key={s}>
              <button
                type="button"
                onClick={() => go(s)}
                aria-current={s === step ? 'step' : undefined}
                className={`w-full whitespace-nowrap rounded-md px-3 py-2 text-left ${s === step ? 'bg-tide text-white' : data[s] ? 'bg-tide-pale text-tide-deep' : 'text-ink-soft hover:bg-paper-sunk'}`}
              >
                <span className="figure mr-2">{i + 1}</span>
                {stepTitles[s]}
                {data[s] && s !== step ? ' ✓' : ''}
              </button>
            </li>
          ))}
        </ol>
      </nav>

      <Form form={form} onSubmit={submit} className="card min-w-0 space-y-5">
        <header>
          <p className="text-sm text-ink-muted">
            Step {index + 1} of {stepIds.length} · saved as a draft at every step
          </p>
          <h2 className="text-xl font-semibold">{stepTitles[step]}</h2>
        </header>

        {step === 'home' && (
          <div className="grid gap-4 sm:grid-cols-2">
            <div className="sm:col-span-2">
              <Field name="addressLine" label="Address" autoComplete="street-address" />
            </div>
            <Field name="town" label="Town" />
            <Field name="postcode" label="Postcode" />
            <Field name="occupants" label="People living there" type="number" inputMode="numeric" />
            <Field name="contactName" label="Householder’s name" autoComplete="name" />
            <Field name="contactEmail" label="Householder’s e-mail" type="email" autoComplete="email" />
            <Field name="contactPhone" label="Householder’s telephone (optional)" type="tel" />
          </div>
        )}

        {step === 'cylinder' && (
          <div className="grid gap-4 sm:grid-cols-2">
            <div className="sm:col-span-2 space-y-2">
              <Field
                name="serial"
                label="Serial number"
                hint="Typed from the data plate, or scanned from its barcode or QR code."
              />
              <SerialScanner onSerial={(s) => form.setValue('serial', s, { shouldDirty: true })} />
            </div>
            <Field name="model" label="Cylinder model" />
            <Field name="volumeL" label="Volume" unit="L" type="number" inputMode="numeric" />
            <Field name="heightM" label="Height" unit="m" type="number" />
            <Field name="sensorCount" label="Temperature sensors" type="number" inputMode="numeric" />
            <div className="sm:col-span-2">
              <Field
                name="sensorHeightsM"
                label="Sensor heights above the bottom, bottom to top (optional)"
                unit="m"
                hint="Comma-separated, e.g. 0.1, 0.25, 0.4 … Leave empty when the sensors are evenly spaced."
              />
            </div>
            <Select
              name="exchanger"
              label="Heat exchanger"
              options={exchangers.map((x) => ({ value: x, label: exchangerLabels[x] }))}
            />
            <Field name="immersionW" label="Immersion rating" unit="W" type="number" inputMode="numeric" />
            <Field
              name="declaredLossW"
              label="Declared standing loss (optional)"
              unit="W"
              type="number"
              hint="From the cylinder’s energy label or data sheet."
            />
          </div>
        )}

        {step === 'heat_source' && (
          <div className="space-y-4">
            <Select
              name="heatSource"
              label="Heat source"
              options={heatSourceKinds.map((k) => ({ value: k, label: heatSourceDescriptions[k] }))}
            />
            {isHeatSource(values.heatSource) && hasHeatPump(values.heatSource) && (
              <>
                <Select
                  name="heatPumpModelId"
                  label="Heat-pump model"
                  hint={
                    models.data?.models.length
                      ? 'The list is kept by your company’s administrator. Choose “Choose…” to enter a sensor curve by hand.'
                      : 'Your company has no heat-pump models listed yet: enter the sensor input’s curve by hand, or ask an administrator to add the model.'
                  }
                  options={(models.data?.models ?? []).map((m) => ({
                    value: m.id,
                    label: `${m.name} (${(m.outputW / 1000).toFixed(1)} kW, NTC ${m.ntcR25Ohm / 1000} kΩ, B ${m.ntcBetaK} K)`,
                  }))}
                />
                <div className="grid gap-4 sm:grid-cols-3">
                  <Field name="hpOutputW" label="Heat pump output" unit="W" type="number" />
                  <Field
                    name="ntcR25Ohm"
                    label="Sensor input: R at 25 °C"
                    unit="Ω"
                    type="number"
                    readOnly={!!values.heatPumpModelId}
                  />
                  <Field
                    name="ntcBetaK"
                    label="Sensor input: B value"
                    unit="K"
                    type="number"
                    readOnly={!!values.heatPumpModelId}
                  />
                  <Field
                    name="callC"
                    label="Heat pump should read, to heat"
                    unit="°C"
                    type="number"
                    hint="Well below the heat pump’s own hot-water start point."
                  />
                  <Field
                    name="satisfiedC"
                    label="Heat pump should read, when satisfied"
                    unit="°C"
                    type="number"
                    hint="Above the heat pump’s own hot-water stop point."
                  />
                </div>
                <ThermistorPanel
                  r25Ohm={values.ntcR25Ohm}
                  betaK={values.ntcBetaK}
                  callC={values.callC}
                  satisfiedC={values.satisfiedC}
                />
              </>
            )}
          </div>
        )}

        {step === 'target' && (
          <div className="space-y-4">
            <div className="grid gap-4 sm:grid-cols-2">
              <Field name="targetC" label="Target (storage) temperature" unit="°C" type="number" />
              <Field name="hysteresisK" label="Reheat when it falls this far below" unit="K" type="number" />
            </div>
            {Number(values.targetC) < LEGIONELLA_STORE_C && (
              <Field
                name="belowSixtyPlan"
                label={`How is the water raised to ${LEGIONELLA_STORE_C} °C or above?`}
                hint="e.g. weekly immersion cycle on Sunday at 14:00, or the heat pump’s own pasteurisation programme."
              />
            )}
            <Caution title="Legionella.">{LEGIONELLA_GUIDANCE}</Caution>
            <Caution title="Scalding.">{SCALD_CAUTION}</Caution>
          </div>
        )}

        {step === 'controls' && (
          <div className="space-y-4">
            <Select
              name="externalControl"
              label="Is an external programmer or thermostat wired in?"
              options={[
                { value: 'none', label: 'No: Heatlayer’s controller decides' },
                { value: 'programmer', label: 'An external programmer' },
                { value: 'thermostat', label: 'An external cylinder thermostat' },
                { value: 'both', label: 'Both a programmer and a thermostat' },
              ]}
            />
            <Field name="controlNotes" label="Notes on the wiring (optional)" />
            <Caution title="Electrical work.">{ELECTRICAL_CAUTION}</Caution>
          </div>
        )}

        {step === 'connection' && <ConnectionCheck id={props.id} onReceived={setReceived} />}

        {step === 'safety' && (
          <div className="space-y-3">
            <Caution title="Competent person.">{UNVENTED_CAUTION}</Caution>
            {safetyItems.map((i) => (
              <Check key={i.id} name={i.id} label={i.label} />
            ))}
            <Check
              name="competentPerson"
              label="I am a competent person for unvented hot-water storage, licensed as local building regulations require, and did this work myself."
            />
            <Field name="registrationNumber" label="Registration or licence number (optional)" />
          </div>
        )}

        {step === 'photos' && (
          <UploadPanel target={{ commissioningId: props.id }} initial={uploads} onChange={setUploads} />
        )}

        {step === 'signoff' && (
          <div className="space-y-4">
            <p className="text-sm text-ink-soft">
              Signing off locks the record (later changes are amendments, with who and when), makes the commissioning
              record PDF, and e-mails the householder an invitation to Heatlayer and the record.
            </p>
            {!received && (
              <Caution title="No telemetry yet.">
                Complete the connection check first: the record is signed off once the cylinder reports.
              </Caution>
            )}
            <Field name="householderEmail" label="Send the invitation and record to" type="email" />
            <Field name="notes" label="Notes for the record (optional)" />
          </div>
        )}

        <footer className="flex flex-wrap items-center gap-2 border-t border-line pt-4">
          {index > 0 && (
            <button type="button" className="btn-quiet" onClick={() => go(stepIds[index - 1])}>
              Back
            </button>
          )}
          <button type="submit" className="btn-primary ml-auto" disabled={busy}>
            {busy
              ? 'Saving…'
              : step === 'signoff'
                ? 'Sign off and send'
                : step === 'connection' && !received
                  ? 'Continue without waiting'
                  : 'Save and continue'}
          </button>
        </footer>
      </Form>
    </div>
  );
}

export default withQuery(Wizard);
