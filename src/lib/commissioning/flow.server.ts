// The commissioning flow on the server: save a step, register the cylinder for its connection
// check, sign off (lock, PDF, handover mail), amend. Endpoints stay thin and call these.
import {
  addAmendment,
  findHeatPumpModel,
  getCommissioning,
  latestTelemetry,
  listAmendments,
  listUploads,
  markHandoverSent,
  registerInstall,
  saveDraftStep,
  serialTaken,
  setRecordDocument,
  signOffRecord,
} from '../../db/queries/commissioning';
import { getHomeInScope } from '../../db/queries/home-access';
import type { Commissioning } from '../../db/schema';
import { inviteHouseholder } from '../accounts/invitations';
import { commissioningPdf } from '../documents/commissioning-pdf';
import { sendMail } from '../mail/send';
import { HttpError, scopeOf } from '../server/authz';
import type { Viewer } from '../server/viewer';
import { getObject, putObject } from '../storage/objects.server';
import { generateDeviceToken, hashDeviceToken } from '../telemetry/device-token';
import { publishAsService } from '../telemetry/service-client.server';
import { CREDENTIALS_ROTATED_TOPIC, topicFor } from '../telemetry/wire';
import { amendableFields, amendedAnswers, fieldValue, type AmendableFieldId } from './amendments';
import { handoverMail } from './handover-mail';
import { hasHeatPump } from '../heat-sources';
import { recordPdfKey, recordView, thermistorSnapshot, type SignedRecord } from './record';
import {
  registrationSteps,
  stepIds,
  stepSchemas,
  validateAnswers,
  type CommissioningAnswers,
  type CylinderStep,
  type HeatSourceStep,
  type StepId,
} from './steps';

const invalid = (
  problems: { field: string; message: string }[],
  message = 'Some answers need attention; see the fields.',
) => new HttpError(422, 'InvalidAnswers', message, problems);
const notFound = () => new HttpError(404, 'NotFound', 'There is no such commissioning record.');
const locked = () =>
  new HttpError(
    409,
    'RecordLocked',
    'This commissioning record is signed and locked. Record a change as an amendment instead.',
  );

export async function loadCommissioning(viewer: Viewer, id: string): Promise<Commissioning> {
  const row = await getCommissioning(viewer.companyId, id);
  if (!row) throw notFound();
  return row;
}

/** Validates and saves one step of a draft; the wizard moves on to `next`. */
export async function saveStep(viewer: Viewer, id: string, step: StepId, value: unknown): Promise<Commissioning> {
  const current = await loadCommissioning(viewer, id);
  if (current.status === 'signed') throw locked();
  const parsed = stepSchemas[step].safeParse(value ?? {});
  if (!parsed.success)
    throw invalid(
      parsed.error.issues.map((i) => ({ field: `${step}.${i.path.join('.') || '(step)'}`, message: i.message })),
    );
  let saved: unknown = parsed.data;
  if (step === 'cylinder') {
    const serial = (parsed.data as CylinderStep).serial;
    if (await serialTaken(serial, current.tankId))
      throw new HttpError(
        409,
        'SerialTaken',
        `A cylinder with serial ${serial} is already registered. Check the serial on the data plate.`,
        [{ field: 'cylinder.serial', message: 'Already registered.' }],
      );
  }
  if (step === 'heat_source') saved = await withModelCurve(viewer, parsed.data as HeatSourceStep);
  const next = stepIds[Math.min(stepIds.indexOf(step) + 1, stepIds.length - 1)];
  const r = await saveDraftStep(viewer.companyId, id, step, saved, next);
  if (!r.ok) throw r.reason === 'locked' ? locked() : notFound();
  return r.row;
}

/** A heat pump chosen from the company's list takes its sensor curve and output from the list. */
async function withModelCurve(viewer: Viewer, s: HeatSourceStep): Promise<HeatSourceStep> {
  if (!hasHeatPump(s.heatSource) || !s.heatPumpModelId) return s;
  const model = await findHeatPumpModel(viewer.companyId, s.heatPumpModelId);
  if (!model)
    throw invalid([
      {
        field: 'heat_source.heatPumpModelId',
        message: 'That heat-pump model is not in your company’s list (it may have been removed). Choose another.',
      },
    ]);
  return {
    ...s,
    heatPumpName: model.name,
    ntcR25Ohm: model.ntcR25Ohm,
    ntcBetaK: model.ntcBetaK,
    hpOutputW: s.hpOutputW ?? model.outputW,
  };
}

/**
 * Registers the cylinder (home and tank rows) and issues its first device token, shown once.
 * Called again (e.g. the token was lost) it issues a new token and the old one stops working.
 */
export async function registerForConnection(viewer: Viewer, id: string) {
  const row = await loadCommissioning(viewer, id);
  if (row.status === 'signed') throw locked();
  const v = validateAnswers(row.data, registrationSteps);
  if (!v.ok)
    throw invalid(
      v.problems,
      'Complete the home, cylinder, heat source and target steps before registering the cylinder.',
    );
  const token = generateDeviceToken();
  const r = await registerInstall(
    viewer.companyId,
    id,
    v.answers as Required<Pick<CommissioningAnswers, 'home' | 'cylinder' | 'heat_source' | 'target'>>,
    hashDeviceToken(token),
    viewer.userId,
  );
  if (!r.ok) {
    if (r.reason === 'serial_taken')
      throw new HttpError(
        409,
        'SerialTaken',
        'A cylinder with this serial is already registered. Check the serial on the data plate.',
        [{ field: 'cylinder.serial', message: 'Already registered.' }],
      );
    throw r.reason === 'locked' ? locked() : notFound();
  }
  const serial = v.answers.cylinder!.serial;
  if (row.tankId) {
    // A new token for a tank that had one: end its broker sessions (HTTP ingest looks tokens up each time).
    await publishAsService(CREDENTIALS_ROTATED_TOPIC, serial).catch((err) => {
      console.error(
        `[commissioning] could not tell the broker that ${serial}'s token changed:`,
        err instanceof Error ? err.message : err,
      );
    });
  }
  return {
    tankId: r.tankId,
    serial,
    token,
    notice: 'Enter this device token in the cylinder’s controller now: it is shown only once.',
    mqtt: { username: serial, telemetryTopic: topicFor(serial, 'telemetry') },
    http: { url: '/api/ingest', header: 'Authorization: Bearer <token>' },
  };
}

/** What the connection check shows: the first telemetry from the tank, once it has arrived. */
export async function connectionState(viewer: Viewer, id: string) {
  const row = await loadCommissioning(viewer, id);
  if (!row.tankId) return { registered: false as const };
  const t = await latestTelemetry(row.tankId);
  return {
    registered: true as const,
    tankId: row.tankId,
    received: !!t,
    telemetry: t ? { ...t, ts: t.ts.toISOString() } : null,
  };
}

/**
 * Signs the record off: every step valid, first telemetry received. Locks it in one
 * transaction, then makes the PDF, stores it, invites the householder (the accounts
 * invitation path) and e-mails the PDF. A sign-off whose handover did not finish
 * (mail server down) finishes it when asked again.
 */
export async function signOff(viewer: Viewer, id: string) {
  let row = await loadCommissioning(viewer, id);
  if (row.status === 'signed' && row.handoverSentAt) throw locked();
  if (row.status === 'draft') {
    const v = validateAnswers(row.data, ['home', 'cylinder', 'heat_source', 'target', 'controls', 'safety', 'signoff']);
    if (!v.ok)
      throw invalid(v.problems, 'The record cannot be signed off yet: some answers are missing or need attention.');
    const answers = v.answers as CommissioningAnswers;
    if (!row.tankId)
      throw new HttpError(
        422,
        'NotRegistered',
        'Register the cylinder and complete the connection check before signing off.',
        [{ field: 'connection', message: 'Not registered.' }],
      );
    const t = await latestTelemetry(row.tankId);
    if (!t)
      throw new HttpError(
        422,
        'NoTelemetryYet',
        'No telemetry has arrived from this cylinder yet. Check its controller’s connection and device token, then sign off once its layers show.',
        [{ field: 'connection', message: 'No telemetry yet.' }],
      );
    const thermistor = thermistorSnapshot(answers.heat_source);
    const home = await getHomeInScope(scopeOf(viewer), row.homeId!);
    const record: SignedRecord = {
      version: 1,
      recordId: row.id,
      companyName: viewer.companyName,
      homeReference: home?.reference ?? '',
      serial: answers.cylinder.serial,
      answers,
      thermistor,
      firstTelemetry: { ts: t.ts.toISOString(), layersC: t.layersC },
      engineer: { name: viewer.name, email: viewer.email },
      signedAt: new Date().toISOString(),
      attachments: (await listUploads(viewer.companyId, { commissioningId: row.id })).length,
    };
    const r = await signOffRecord(
      viewer.companyId,
      id,
      answers,
      record as unknown as Record<string, unknown>,
      viewer.userId,
    );
    if (!r.ok)
      throw r.reason === 'locked'
        ? locked()
        : r.reason === 'not_registered'
          ? new HttpError(422, 'NotRegistered', 'Register the cylinder before signing off.')
          : notFound();
    row = r.row;
  }
  await finishHandover(viewer, row);
  return { id: row.id, tankId: row.tankId, signedAt: row.signedAt, pdf: `/api/commissioning/${row.id}/record.pdf` };
}

async function finishHandover(viewer: Viewer, row: Commissioning): Promise<void> {
  const record = row.record as unknown as SignedRecord;
  const pdf = Buffer.from(await commissioningPdf(recordView(record)));
  const key = recordPdfKey(row.companyId, row.id);
  await putObject(key, pdf, 'application/pdf');
  await setRecordDocument(row.id, key);
  const to = record.answers.signoff.householderEmail;
  try {
    await inviteHouseholder(viewer, row.homeId!, { email: to, name: record.answers.home.contactName });
    await sendMail({
      to,
      companyId: viewer.companyId,
      ...handoverMail(record),
      attachments: [
        { filename: `commissioning-record-${record.serial}.pdf`, content: pdf, contentType: 'application/pdf' },
      ],
    });
  } catch (err) {
    console.error('[commissioning] handover mail not sent:', err instanceof Error ? err.message : err);
    throw new HttpError(
      503,
      'HandoverNotSent',
      'The record is signed and locked, but the householder’s e-mail could not be sent just now. Press “Sign off and send” again in a minute to send it.',
    );
  }
  await markHandoverSent(row.id);
}

/** The stored PDF of a signed record, or null. */
export async function recordPdf(viewer: Viewer, id: string): Promise<{ bytes: Buffer; serial: string } | null> {
  const row = await loadCommissioning(viewer, id);
  if (row.status !== 'signed')
    throw new HttpError(409, 'NotSigned', 'This record is still a draft: its PDF is made when it is signed off.');
  if (!row.pdfKey) return null;
  const bytes = await getObject(row.pdfKey);
  return bytes ? { bytes, serial: (row.record as unknown as SignedRecord).serial } : null;
}

/** Amends a signed record: the change is kept beside the original, with who and when. */
export async function amend(
  viewer: Viewer,
  id: string,
  input: { field: AmendableFieldId; value?: unknown; reason: string },
) {
  const row = await loadCommissioning(viewer, id);
  if (row.status !== 'signed')
    throw new HttpError(409, 'NotSigned', 'This record is still a draft: change the answer in the wizard instead.');
  const spec = amendableFields[input.field];
  const parsed = spec.schema.safeParse(input.value);
  if (!parsed.success) throw invalid(parsed.error.issues.map((i) => ({ field: 'value', message: i.message })));
  const record = row.record as unknown as SignedRecord;
  const before = fieldValue(
    amendedAnswers(record.answers as unknown as Record<string, unknown>, await listAmendments(row.id)),
    input.field,
  );
  const r = await addAmendment({
    companyId: viewer.companyId,
    commissioningId: row.id,
    field: input.field,
    oldValue: before,
    newValue: parsed.data,
    reason: input.reason,
    actorUserId: viewer.userId,
    tankColumn: 'tankColumn' in spec ? spec.tankColumn : undefined,
  });
  if (!r.ok) throw notFound();
  return r.amendment;
}
