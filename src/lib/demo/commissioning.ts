// The signed commissioning record of a demo tank, as the wizard would have produced it on the day:
// every step's answers passed through the wizard's own schemas, the thermistor settings from the
// thermal core, and the first reading the connection check saw. Pure and deterministic, given the
// record's id and when it was signed.
import { capabilities } from '../heat-sources';
import { validateAnswers, type CommissioningAnswers } from '../commissioning/steps';
import { thermistorSnapshot, type SignedRecord } from '../commissioning/record';
import type { DemoCommissioning, DemoTank } from './scenario';

export interface DemoRecordContext {
  recordId: string;
  companyName: string;
  engineer: { name: string | null; email: string };
  signedAt: Date;
}

/** The heat pump's hot-water sensor reads the cylinder's target when satisfied, and the target less its differential when calling. */
function callAndSatisfied(t: DemoTank): { callC: number; satisfiedC: number } {
  return { callC: t.targetC - t.hysteresisK, satisfiedC: t.targetC };
}

function demoAnswers(t: DemoTank, c: DemoCommissioning): CommissioningAnswers {
  const hp = c.heatPump;
  const raw = {
    home: {
      addressLine: t.addressLine,
      town: t.town,
      postcode: t.postcode,
      occupants: t.occupants,
      contactName: t.contactName,
      contactEmail: t.contactEmail,
    },
    cylinder: {
      serial: t.serial,
      model: t.model,
      volumeL: t.volumeL,
      heightM: t.heightM,
      sensorCount: t.sensorCount,
      exchanger: capabilities(t.heatSource).exchanger ?? 'none',
      immersionW: t.immersionW,
      declaredLossW: t.declaredLossW,
    },
    heat_source: hp
      ? {
          heatSource: t.heatSource,
          heatPumpName: hp.name,
          hpOutputW: t.hpOutputW,
          ntcR25Ohm: hp.ntcR25Ohm,
          ntcBetaK: hp.ntcBetaK,
          ...callAndSatisfied(t),
        }
      : { heatSource: t.heatSource },
    target: {
      targetC: t.targetC,
      hysteresisK: t.hysteresisK,
      ...(t.targetC < 60
        ? { belowSixtyPlan: 'Weekly pasteurisation: the store is raised to 60 °C or above once a week.' }
        : {}),
    },
    controls: {
      externalControl: c.externalControl,
      ...(c.externalControl === 'programmer'
        ? { controlNotes: 'Existing programmer kept; the cylinder controller follows its hot-water channel.' }
        : {}),
    },
    safety: {
      expansion: true,
      reliefValve: true,
      discharge: true,
      reducingValve: true,
      isolation: true,
      competentPerson: true,
      registrationNumber: c.registrationNumber,
    },
    signoff: { householderEmail: t.contactEmail },
  };
  const v = validateAnswers(raw, ['home', 'cylinder', 'heat_source', 'target', 'controls', 'safety', 'signoff']);
  if (!v.ok)
    throw new Error(
      `Demo commissioning of ${t.serial} does not pass the wizard's checks: ${v.problems.map((p) => `${p.field}: ${p.message}`).join(' ')}`,
    );
  return v.answers as CommissioningAnswers;
}

/** A plausible first reading: cold at the bottom, the target at the top, evenly between. */
function firstLayers(t: DemoTank): number[] {
  const n = t.sensorCount;
  return Array.from({ length: n }, (_, i) => Math.round((12 + ((t.targetC - 12) * i) / Math.max(1, n - 1)) * 10) / 10);
}

export function demoSignedRecord(t: DemoTank, c: DemoCommissioning, ctx: DemoRecordContext): SignedRecord {
  const answers = demoAnswers(t, c);
  return {
    version: 1,
    recordId: ctx.recordId,
    companyName: ctx.companyName,
    homeReference: t.homeRef,
    serial: t.serial,
    answers,
    thermistor: thermistorSnapshot(answers.heat_source),
    // The connection check saw the first reading a little before sign-off.
    firstTelemetry: { ts: new Date(ctx.signedAt.getTime() - 20 * 60_000).toISOString(), layersC: firstLayers(t) },
    engineer: ctx.engineer,
    signedAt: ctx.signedAt.toISOString(),
    attachments: c.photos.length,
  };
}
