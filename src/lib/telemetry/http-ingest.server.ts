// `POST /api/ingest`: the HTTP path for gateways that do not speak MQTT. Same validation
// (parseTelemetry) and same writer as the MQTT worker; answers with counts. It runs in the ingest
// tier (scripts/ingest-worker.ts listens on INGEST_PORT), so a gateway's backfill never takes the
// web server's time; the web's route only checks the token's form, reads the bounded body and
// forwards it (`forwardToIngest`).
import { getPool } from '../../db';
import { findIngestTankByTokenHash, insertDeadLetters, type IngestTank } from '../../db/queries/telemetry';
import { HttpError } from '../server/authz';
import { readBoundedBody } from '../server/body';
import { errorAnswer } from '../server/endpoint';
import { json } from '../server/http';
import { env } from '../server/env';
import { hashDeviceToken } from './device-token';
import { limits, parseTelemetry, type RejectCode } from './wire';
import { TelemetryWriter } from './writer.server';

let writer: TelemetryWriter | null = null;

export interface IngestAnswer {
  accepted: number;
  duplicate: number;
  rejected: number;
  rejections: { index: number; code: RejectCode; reason: string; fields: { field: string; message: string }[] }[];
}

const statusOf: Partial<Record<RejectCode, number>> = { PayloadTooLarge: 413, BatchTooLarge: 413, SerialMismatch: 403 };

/** The token presented as `Authorization: Bearer <token>`; 401 when there is none. */
export function bearerToken(header: string | null): string {
  const m = header?.match(/^Bearer\s+(\S+)\s*$/i);
  if (!m)
    throw new HttpError(
      401,
      'DeviceTokenRequired',
      'Send the tank\'s device token as "Authorization: Bearer <token>".',
    );
  return m[1]!;
}

/**
 * The tank whose token is presented; 401 otherwise. Looked up on every request (one indexed row,
 * against a batch of readings), so a token rotated a moment ago is refused at once.
 */
async function deviceFromAuthorization(header: string | null): Promise<IngestTank> {
  const tank = await findIngestTankByTokenHash(hashDeviceToken(bearerToken(header)));
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
async function ingestHttp(tank: IngestTank, body: Buffer): Promise<IngestAnswer> {
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

/** The ingest tier's answer to one `POST /api/ingest`: 202 with the counts, or the problem. */
export async function answerIngest(request: Request): Promise<Response> {
  try {
    const tank = await deviceFromAuthorization(request.headers.get('authorization'));
    const body = await readLimitedBody(request);
    return json(await ingestHttp(tank, body), 202);
  } catch (err) {
    return errorAnswer(err, 'POST /api/ingest (ingest tier)');
  }
}

/** The web's side of `POST /api/ingest`: the body as read, sent on to the ingest tier, its answer passed back. */
export async function forwardToIngest(authorization: string, body: Buffer): Promise<Response> {
  let res: Response;
  try {
    res = await fetch(`${env().INGEST_URL}/api/ingest`, {
      method: 'POST',
      headers: { authorization, 'content-type': 'application/json' },
      // The bytes as read (up to 1 MiB), not a copy: a Buffer is a Uint8Array over a plain ArrayBuffer here.
      body: body as Uint8Array<ArrayBuffer>,
      signal: AbortSignal.timeout(60_000),
    });
  } catch (err) {
    console.error('[ingest] the ingest tier is not reachable:', err instanceof Error ? err.message : err);
    throw new HttpError(
      503,
      'IngestUnavailable',
      'The readings could not be passed on for storage just now; nothing was kept. Send the same batch again in a few seconds.',
    );
  }
  return new Response(await res.arrayBuffer(), {
    status: res.status,
    headers: {
      'content-type': res.headers.get('content-type') ?? 'application/json; charset=utf-8',
      'cache-control': 'no-store',
    },
  });
}
