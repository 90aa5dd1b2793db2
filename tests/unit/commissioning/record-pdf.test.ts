import { describe, expect, it } from 'vitest';
import { commissioningPdf, pdfText as toPdfText } from '../../../src/lib/documents/commissioning-pdf';
import { recordView, type SignedRecord } from '../../../src/lib/commissioning/record';
import { thermistorSettings } from '../../../src/lib/thermal/index';
import { pdfText } from '../../support/commissioning';

const sensor = { r25Ohm: 10_000, betaK: 3977 };
const s = thermistorSettings({ sensor, callC: 6, satisfiedC: 47 });
const record: SignedRecord = {
  version: 1,
  recordId: '5f0c2d8e-0000-4000-8000-000000000001',
  companyName: 'Kestrel Vale Heating Co-operative',
  homeReference: 'INS-0A1B2C',
  serial: 'C210-UT-0001',
  answers: {
    home: {
      addressLine: '3 Example Row',
      town: 'Ashby Wend',
      postcode: 'WM1 3XY',
      occupants: 3,
      contactName: 'Robin Example',
      contactEmail: 'robin@example.com',
    },
    cylinder: {
      serial: 'C210-UT-0001',
      model: 'C210 cylinder',
      volumeL: 210,
      heightM: 1.6,
      sensorCount: 4,
      exchanger: 'plate_ports',
      immersionW: 3000,
      declaredLossW: 1.6,
    },
    heat_source: {
      heatSource: 'hp_plate',
      heatPumpName: '8 kW air-source',
      hpOutputW: 8000,
      ntcR25Ohm: 10_000,
      ntcBetaK: 3977,
      callC: 6,
      satisfiedC: 47,
    },
    target: { targetC: 60, hysteresisK: 5 },
    controls: { externalControl: 'none' },
    safety: {
      expansion: true,
      reliefValve: true,
      discharge: true,
      reducingValve: true,
      isolation: true,
      competentPerson: true,
    },
    signoff: { householderEmail: 'robin@example.com' },
  },
  thermistor: {
    heatPumpName: '8 kW air-source',
    r25Ohm: 10_000,
    betaK: 3977,
    callC: 6,
    satisfiedC: 47,
    callOhm: s.callOhm,
    satisfiedOhm: s.satisfiedOhm,
  },
  firstTelemetry: { ts: '2026-03-01T09:30:00.000Z', layersC: [18.5, 30, 52.25, 58] },
  engineer: { name: 'Field Engineer', email: 'engineer@kestrelvale.example.com' },
  signedAt: '2026-03-01T10:00:00.000Z',
  attachments: 2,
};

describe('commissioning record PDF', () => {
  it('carries the record, the resistances set and the cautions, readable back as text', async () => {
    const text = await pdfText(await commissioningPdf(recordView(record)));
    expect(text).toContain('Hot-water cylinder commissioning record');
    expect(text).toContain('C210-UT-0001');
    expect(text).toContain('3 Example Row, Ashby Wend WM1 3XY');
    // 10 kΩ NTC, B 3977 K: ≈ 24.8 kΩ at 6 °C and ≈ 4.0 kΩ at 47 °C (common practice).
    expect(text).toContain('24.79 kohm (reads 6 °C)');
    expect(text).toMatch(/4\.0\d kohm \(reads 47 °C\)/);
    expect(text).toContain('18.5 °C, 30.0 °C, 52.3 °C, 58.0 °C');
    expect(text).toContain('competent, licensed person');
    expect(text).toContain('HSG274');
  });

  it('writes symbols the standard fonts lack in words', () => {
    expect(toPdfText('24.83 kΩ − ≈ 5 K⁻¹')).toBe('24.83 kohm - ~ 5 K^-1');
  });
});
