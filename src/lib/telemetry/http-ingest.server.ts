// `POST /api/ingest`: the HTTP path for gateways that do not speak MQTT. Same validation
// (parseTelemetry) and same writer as the MQTT worker; answers with counts.
import { getPool } from '../../db';
import { insertDeadLetters, type IngestTank } from '../../db/queries/telemetry';
import { HttpError } from '../server/authz';
import { readBoundedBody } from '../server/body';
import { env } from '../server/env';
import { hashDeviceToken } from './device-token';
import { TankDirectory } from './tank-directory.server';
import { limits, parseTelemetry, type RejectCode } from './wire';
import { TelemetryWriter } from './writer.server';

let directory: TankDirectory | null = null;
let writer: TelemetryWriter | null = null;

/** The web process's cache of tanks by token hash (cleared when a token is rotated here). */
export function ingestDirectory(): TankDirectory {
  return (directory ??= new TankDirectory());
}

export interface IngestAnswer {
  accepted: number;
  duplicate: number;
  rejected: number;
  rejections: { index: number; code: RejectCode; reason: string; fields: { field: string; message: string }[] }[];
}

const statusOf: Partial<Record<RejectCode, number>> = { PayloadTooLarge: 413, BatchTooLarge: 413, SerialMismatch: 403 };

/** The tank whose token is presented as `Authorization: Bearer <token>`; 401 otherwise. */
export async function deviceFromAuthorization(header: string | null): Promise<IngestTank> {
  const m = header?.match(/^Bearer\s+(\S+)\s*$/i);
  if (!m)
    throw new HttpError(
      401,
      'DeviceTokenRequired',
      'Send the tank\'s device token as "Authorization: Bearer <token>".',
    );
  const tank = await ingestDirectory().byTokenHash(hashDeviceToken(m[1]));
  if (!tank)
    throw new HttpError(
      401,
      'DeviceTokenInvalid',
      'This device token is not valid (it may have been rotated). Ask the company administrator for the current one.',
    );
  return tank;
}

/** Reads the body, refusing (413) anything over the payload limit without reading it all. */
export function readLimitedBody(request: Request): Promise<Buffer> {
  return readBoundedBody(
    request,
    limits.maxPayloadBytes,
    () =>
      new HttpError(
        413,
        'PayloadTooLarge',
        `The body is larger than ${limits.maxPayloadBytes} bytes. Send the backlog in batches of at most ${limits.maxBatch} readings.`,
      ),
  );
}

/** Validates and stores one request's reading or batch for `tank`. */
export async function ingestHttp(tank: IngestTank, body: Buffer): Promise<IngestAnswer> {
  const parsed = parseTelemetry(body, {
    now: Date.now(),
    tank: { serial: tank.serial, sensorCount: tank.sensorCount },
    retentionDays: env().READINGS_RETENTION_DAYS,
  });
  const letter = (
    reasonCode: string,
    reason: string,
    fields: { field: string; message: string }[],
    payload: Buffer,
  ) => ({
    tankId: tank.id,
    serial: tank.serial,
    transport: 'http' as const,
    topic: null,
    reasonCode,
    reason,
    fields,
    payload,
  });
  if (!parsed.ok) {
    await insertDeadLetters([letter(parsed.code, parsed.reason, parsed.fields, body)]).catch(() => undefined);
    throw new HttpError(statusOf[parsed.code] ?? 400, parsed.code, parsed.reason, parsed.fields);
  }
  if (!parsed.batch && parsed.rejected.length === 1) {
    const r = parsed.rejected[0];
    await insertDeadLetters([letter(r.code, r.reason, r.fields, body)]).catch(() => undefined);
    throw new HttpError(400, r.code, r.reason, r.fields);
  }
  const deadLetters = parsed.rejected.map((r) =>
    letter(r.code, `readings[${r.index}]: ${r.reason}`, r.fields, Buffer.from(JSON.stringify(r.raw) ?? 'null')),
  );
  writer ??= new TelemetryWriter(getPool());
  let result: Awaited<ReturnType<TelemetryWriter['write']>>;
  try {
    result = await writer.write({ readings: parsed.readings.map((reading) => ({ tank, reading })), deadLetters });
  } catch (err) {
    console.error('[ingest] HTTP batch not stored:', err instanceof Error ? err.message : err);
    throw new HttpError(
      503,
      'StorageUnavailable',
      'The readings could not be stored just now; nothing was kept. Send the same batch again in a few seconds.',
    );
  }
  return {
    accepted: result.inserted,
    duplicate: result.duplicates,
    rejected: parsed.rejected.length,
    rejections: parsed.rejected.map(({ index, code, reason, fields }) => ({ index, code, reason, fields })),
  };
}
