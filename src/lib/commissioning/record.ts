// The signed commissioning record: the snapshot frozen at sign-off, and the same facts laid out
// in labelled sections for the PDF and the record page. Pure.
import { ALL_CAUTIONS } from './cautions';
import { hasHeatPump, heatSourceDescriptions } from '../heat-sources';
import { formatOhm, thermistorWorking } from './thermistor';
import { exchangerLabels, safetyItems, stepTitles, type CommissioningAnswers, type HeatSourceStep } from './steps';

export interface SignedRecord {
  version: 1;
  recordId: string;
  companyName: string;
  homeReference: string;
  serial: string;
  answers: CommissioningAnswers;
  /** The resistances set on the controller (heat pumps only), from the thermal core. */
  thermistor: {
    heatPumpName: string | null;
    r25Ohm: number;
    betaK: number;
    callC: number;
    satisfiedC: number;
    callOhm: number;
    satisfiedOhm: number;
  } | null;
  /** The first telemetry seen during the connection check. */
  firstTelemetry: { ts: string; layersC: (number | null)[] };
  engineer: { name: string | null; email: string };
  signedAt: string;
  attachments: number;
}

/** Where a signed record's PDF is stored (object key, under the company's prefix). */
export const recordPdfKey = (companyId: string, recordId: string): string =>
  `${companyId}/commissioning/${recordId}/record.pdf`;

/** The resistances to set on the controller, where a heat pump reads the cylinder's sensor (null otherwise). */
export function thermistorSnapshot(hs: HeatSourceStep): SignedRecord['thermistor'] {
  if (!hasHeatPump(hs.heatSource)) return null;
  const w = thermistorWorking({
    sensor: { r25Ohm: hs.ntcR25Ohm!, betaK: hs.ntcBetaK! },
    callC: hs.callC!,
    satisfiedC: hs.satisfiedC!,
  });
  return {
    heatPumpName: hs.heatPumpName ?? null,
    r25Ohm: hs.ntcR25Ohm!,
    betaK: hs.ntcBetaK!,
    callC: hs.callC!,
    satisfiedC: hs.satisfiedC!,
    callOhm: w.lines[0].ohm,
    satisfiedOhm: w.lines[1].ohm,
  };
}

export interface RecordSection {
  title: string;
  rows: [string, string][];
  notes?: string[];
}
export interface RecordView {
  recordId: string;
  companyName: string;
  serial: string;
  signedAt: string;
  signedAtText: string;
  sections: RecordSection[];
  cautions: string[];
}

// Formatters made once: building one per call is most of the time a record's view takes.
const whenFormat = new Intl.DateTimeFormat('en-GB', {
  day: 'numeric',
  month: 'long',
  year: 'numeric',
  hour: '2-digit',
  minute: '2-digit',
  timeZone: 'UTC',
  timeZoneName: 'short',
});
const kwFormat = new Intl.NumberFormat('en-GB', { maximumFractionDigits: 1 });
const when = (iso: string) => whenFormat.format(new Date(iso));
const kw = (w: number) => `${kwFormat.format(w / 1000)} kW`;
const controlLabels = {
  none: 'None wired in',
  programmer: 'External programmer',
  thermostat: 'External thermostat',
  both: 'External programmer and thermostat',
} as const;

export function recordView(
  r: SignedRecord,
  amendments: readonly {
    field: string;
    newValue: unknown;
    reason: string;
    userEmail: string | null;
    createdAt: Date | string;
  }[] = [],
): RecordView {
  const a = r.answers;
  const sections: RecordSection[] = [
    {
      title: stepTitles.home,
      rows: [
        ['Address', `${a.home.addressLine}, ${a.home.town} ${a.home.postcode}`],
        ['Home reference', r.homeReference],
        [
          'Householder',
          `${a.home.contactName} <${a.home.contactEmail}>${a.home.contactPhone ? `, ${a.home.contactPhone}` : ''}`,
        ],
        ['Occupants', String(a.home.occupants)],
      ],
    },
    {
      title: stepTitles.cylinder,
      rows: [
        ['Serial', r.serial],
        ['Model', `${a.cylinder.model}, ${a.cylinder.volumeL} L, ${a.cylinder.heightM} m tall`],
        [
          'Sensors',
          `${a.cylinder.sensorCount}, ${a.cylinder.sensorHeightsM ? `at ${a.cylinder.sensorHeightsM.join(', ')} m` : 'evenly spaced'} (bottom to top)`,
        ],
        ['Heat exchanger', exchangerLabels[a.cylinder.exchanger]],
        ['Immersion rating', kw(a.cylinder.immersionW)],
        [
          'Declared standing loss',
          a.cylinder.declaredLossW !== undefined ? `${a.cylinder.declaredLossW} W` : 'Not declared',
        ],
      ],
    },
    {
      title: stepTitles.heat_source,
      rows: [
        ['Heat source', heatSourceDescriptions[a.heat_source.heatSource]],
        ...(hasHeatPump(a.heat_source.heatSource) && r.thermistor
          ? ([
              [
                'Heat pump',
                `${r.thermistor.heatPumpName ?? 'Not from the model list'}, ${kw(a.heat_source.hpOutputW ?? 0)}`,
              ],
              ['Sensor input', `NTC ${formatOhm(r.thermistor.r25Ohm)} at 25 °C, B = ${r.thermistor.betaK} K`],
              ['Call for heat', `${formatOhm(r.thermistor.callOhm)} (reads ${r.thermistor.callC} °C)`],
              ['Satisfied', `${formatOhm(r.thermistor.satisfiedOhm)} (reads ${r.thermistor.satisfiedC} °C)`],
            ] as [string, string][])
          : []),
      ],
      notes: r.thermistor
        ? ['Resistances from the Beta equation R = R25 · exp(B · (1/T - 1/298.15 K)), T in kelvin.']
        : undefined,
    },
    {
      title: 'Temperatures and controls',
      rows: [
        ['Target temperature', `${a.target.targetC} °C, reheat ${a.target.hysteresisK} K below`],
        ...(a.target.belowSixtyPlan ? ([['Pasteurisation plan', a.target.belowSixtyPlan]] as [string, string][]) : []),
        [
          'Programmer / thermostat',
          controlLabels[a.controls.externalControl] + (a.controls.controlNotes ? ` (${a.controls.controlNotes})` : ''),
        ],
      ],
    },
    {
      title: stepTitles.connection,
      rows: [
        ['First telemetry', when(r.firstTelemetry.ts)],
        [
          'Layers, bottom to top',
          r.firstTelemetry.layersC.map((c) => (c === null ? '-' : `${c.toFixed(1)} °C`)).join(', '),
        ],
      ],
    },
    {
      title: stepTitles.safety,
      rows: [
        ...safetyItems.map((i) => [i.label, 'Checked'] as [string, string]),
        [
          'Competent person',
          `Confirmed${a.safety.registrationNumber ? `, registration ${a.safety.registrationNumber}` : ''}`,
        ],
      ],
    },
    {
      title: 'Sign-off',
      rows: [
        ['Engineer', r.engineer.name ? `${r.engineer.name} <${r.engineer.email}>` : r.engineer.email],
        ['Signed', when(r.signedAt)],
        ['Photos and documents', String(r.attachments)],
        ...(a.signoff.notes ? ([['Notes', a.signoff.notes]] as [string, string][]) : []),
      ],
    },
  ];
  if (amendments.length) {
    sections.push({
      title: 'Amendments',
      rows: amendments.map((m) => [
        `${new Date(m.createdAt).toISOString().slice(0, 10)} ${m.userEmail ?? ''}`,
        `${m.field} → ${String(m.newValue)}: ${m.reason}`,
      ]),
    });
  }
  return {
    recordId: r.recordId,
    companyName: r.companyName,
    serial: r.serial,
    signedAt: r.signedAt,
    signedAtText: when(r.signedAt),
    sections,
    cautions: ALL_CAUTIONS,
  };
}
