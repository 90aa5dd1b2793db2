// The wire contract between tanks and Heatlayer: MQTT topics and the JSON of readings, batches,
// commands and command replies. Shared by the MQTT ingest worker, `POST /api/ingest`, the
// simulator and docs/wire-contract.schema.json (generated from these schemas). Pure: no I/O.
//
// Device-facing errors are turned into the contract's own field list below (`zodFieldErrors`).
import { z } from '@/lib/zod';

const WIRE_VERSION = 'v1';
const PREFIX = `heatlayer/${WIRE_VERSION}/tanks`;

/** A tank serial as used in topics and as the MQTT username. */
export const SERIAL_PATTERN = /^[A-Za-z0-9][A-Za-z0-9._-]{0,63}$/;

export type Channel = 'telemetry' | 'status' | 'commands' | 'replies';

/** Topics: telemetry, status (retained online/offline, also the last will) and replies go up; commands come down. */
export const topicFor = (serial: string, channel: Channel): string => `${PREFIX}/${serial}/${channel}`;

/** Heatlayer's own MQTT topics and the ingest worker's client id (its persistent session). */
export const INGEST_CLIENT_ID = 'heatlayer-ingest';
/** Retained `online` while an ingest worker is subscribed; its last will says `offline`. */
export const INGEST_STATUS_TOPIC = `heatlayer/${WIRE_VERSION}/service/ingest/status`;
/** Published by the web after a token rotation (payload: the serial); the broker ends that tank's sessions. */
export const CREDENTIALS_ROTATED_TOPIC = `heatlayer/${WIRE_VERSION}/service/credentials-rotated`;

/** Topic filters the ingest side subscribes to. */
export const ingestFilters = {
  telemetry: `${PREFIX}/+/telemetry`,
  status: `${PREFIX}/+/status`,
  replies: `${PREFIX}/+/replies`,
} as const;

/** `{ serial, channel }` of a Heatlayer topic, or null for anything else. */
export function parseTopic(topic: string): { serial: string; channel: Channel } | null {
  const parts = topic.split('/');
  if (parts.length !== 5 || `${parts[0]}/${parts[1]}/${parts[2]}` !== PREFIX) return null;
  const [, , , serial, channel] = parts;
  if (!SERIAL_PATTERN.test(serial)) return null;
  if (channel !== 'telemetry' && channel !== 'status' && channel !== 'commands' && channel !== 'replies') return null;
  return { serial, channel };
}

/** Bounds every reading and payload must respect. */
export const limits = {
  /** Readings in one batch (MQTT message or HTTP request). */
  maxBatch: 1000,
  /** Bytes in one payload: a full batch of 16-sensor readings is about 250 kB. */
  maxPayloadBytes: 1024 * 1024,
  /**
   * Bytes in one MQTT packet, headers included: a full payload plus 1 KiB for the fixed header,
   * topic and packet id. The broker closes a connection that sends a larger one, unacknowledged.
   */
  maxPacketBytes: 1024 * 1024 + 1024,
  maxLayers: 64,
  /**
   * Plausible stored-water temperatures, °C. Outside this a sensor is miswired or its value
   * misconverted: water in an unvented cylinder is held below 100 °C by its temperature relief
   * valve (which opens at about 90–95 °C, from memory), and a cylinder stands in a frost-free
   * space (common practice). A sensor the device knows is open or shorted is sent as null.
   */
  layerC: { min: -10, max: 105 },
  /** Primary flow and return, °C (a boiler primary runs hotter than stored water; common practice). */
  primaryC: { min: -20, max: 110 },
  /** Electric input, W: a heat pump's compressor plus an immersion element fit well inside this (common practice). */
  maxPowerW: 30_000,
  maxImmersionW: 12_000,
  /** Hot-water draw, l/min: a bath tap runs at about 15–20 (common practice). */
  maxDrawLpm: 60,
  /** How far ahead of the server clock a device clock may run. */
  futureSkewMs: 5 * 60_000,
} as const;

const num = (field: string, unit: string, min: number, max: number) =>
  z
    .number({ error: `${field} must be a number (${unit}).` })
    .min(min, { error: `${field} must be at least ${min} ${unit}.` })
    .max(max, { error: `${field} must be at most ${max} ${unit}.` });

/**
 * Layer temperatures, bottom to top, checked in one pass over the array: a batch of 1000 readings
 * holds some 12,000 of them, and a schema per element cost more than the rest of the reading.
 * Each bad element is reported at its own index (`layersC[3]`), as a per-element schema would.
 */
const layers = z
  .array(z.unknown(), { error: 'layersC must be an array of temperatures in °C, bottom to top.' })
  .min(1, { error: 'layersC must have at least one temperature.' })
  .max(limits.maxLayers, { error: `layersC can have at most ${limits.maxLayers} temperatures.` })
  .check((ctx) => {
    const { min, max } = limits.layerC;
    ctx.value.forEach((t, i) => {
      if (t === null) return;
      const message =
        typeof t !== 'number' || !Number.isFinite(t)
          ? 'Each layer temperature must be a number (°C).'
          : t < min
            ? `Each layer temperature must be at least ${min} °C.`
            : t > max
              ? `Each layer temperature must be at most ${max} °C.`
              : null;
      if (message) ctx.issues.push({ code: 'custom', message, input: t, path: [i] });
    });
  })
  // What each element must be, for the generated JSON Schema (the check above is opaque to it).
  .meta({
    items: { anyOf: [{ type: 'number', minimum: limits.layerC.min, maximum: limits.layerC.max }, { type: 'null' }] },
  }) as unknown as z.ZodType<(number | null)[], (number | null)[]>;

/** One reading as a device sends it. Unknown fields are ignored (newer firmware may send more). */
export const readingSchema = z.object({
  ts: z.union(
    [
      z.iso.datetime({
        offset: true,
        error: 'ts must be an ISO 8601 date-time with a time zone (e.g. 2026-03-01T07:00:00Z).',
      }),
      z.number().int().min(1e11, { error: 'ts must be epoch milliseconds (this value looks like seconds).' }),
    ],
    { error: 'ts must be an ISO 8601 date-time with a time zone, or epoch milliseconds.' },
  ),
  layersC: layers,
  flowC: num('flowC', '°C', limits.primaryC.min, limits.primaryC.max).optional(),
  returnC: num('returnC', '°C', limits.primaryC.min, limits.primaryC.max).optional(),
  compressor: z.boolean({ error: 'compressor must be true (heat pump running for hot water) or false.' }).optional(),
  immersionW: num('immersionW', 'W', 0, limits.maxImmersionW).optional(),
  powerW: num('powerW', 'W', 0, limits.maxPowerW).optional(),
  /**
   * Solar power beyond the household's own use, before any diversion to the immersion, W: what a
   * diverter measures at the meter (export now plus what it already diverts).
   */
  solarSurplusW: num('solarSurplusW', 'W', 0, limits.maxPowerW).optional(),
  pumpPct: num('pumpPct', '%', 0, 100).optional(),
  drawLpm: num('drawLpm', 'l/min', 0, limits.maxDrawLpm).optional(),
  seq: z
    .number({ error: 'seq must be a whole number.' })
    .int({ error: 'seq must be a whole number.' })
    .min(0, { error: 'seq must be zero or more.' })
    .max(2 ** 31 - 1, { error: 'seq must be below 2^31.' })
    .optional(),
});
export type ReadingInput = z.input<typeof readingSchema>;

/** A backlog (after an outage) or a gateway's upload: `{ "readings": [ … ] }`. */
export const batchSchema = z.object({
  /** Optional on the wire; when present it must be the sending tank's serial. */
  serial: z.string().optional(),
  readings: z.array(z.unknown()).min(1, { error: 'readings must hold at least one reading.' }),
});

/** A reading after validation: times in epoch ms, temperatures in °C. */
export interface Reading {
  ts: number;
  layersC: (number | null)[];
  flowC?: number;
  returnC?: number;
  compressor?: boolean;
  immersionW?: number;
  powerW?: number;
  solarSurplusW?: number;
  pumpPct?: number;
  drawLpm?: number;
  seq?: number;
}

export interface FieldError {
  field: string;
  message: string;
}

export type RejectCode =
  | 'InvalidJson'
  | 'InvalidEnvelope'
  | 'PayloadTooLarge'
  | 'BatchTooLarge'
  | 'SerialMismatch'
  | 'InvalidReading'
  | 'LayerCountMismatch'
  | 'TimestampInFuture'
  | 'TimestampTooOld';

export interface RejectedReading {
  index: number;
  code: RejectCode;
  reason: string;
  fields: FieldError[];
  raw: unknown;
}

export type ParsedTelemetry =
  | { ok: false; code: RejectCode; reason: string; fields: FieldError[] }
  | { ok: true; batch: boolean; readings: Reading[]; rejected: RejectedReading[] };

export interface ParseContext {
  /** Server time, epoch ms. */
  now: number;
  /** The sending tank: its serial and how many sensors it has. */
  tank: { serial: string; sensorCount: number };
  /** Readings older than this many days are outside the stored window. */
  retentionDays: number;
}

function fieldErrors(error: z.ZodError, prefix = ''): FieldError[] {
  return error.issues.map((i) => ({
    field:
      prefix +
      (i.path
        .map((p) => (typeof p === 'number' ? `[${p}]` : `.${String(p)}`))
        .join('')
        .replace(/^\./, '') || '(reading)'),
    // A union's own message is the useful one; its branches' messages repeat the type checks.
    message: i.message,
  }));
}

/** Validates one reading against the schema and the sending tank. */
function parseReading(
  raw: unknown,
  ctx: ParseContext,
  index: number | null,
): { reading: Reading } | { rejected: Omit<RejectedReading, 'index' | 'raw'> } {
  const prefix = index === null ? '' : `readings[${index}].`;
  if (typeof raw !== 'object' || raw === null || Array.isArray(raw)) {
    return {
      rejected: {
        code: 'InvalidReading',
        reason: 'A reading must be a JSON object.',
        fields: [
          {
            field: index === null ? '(body)' : `readings[${index}]`,
            message: 'must be an object with ts and layersC.',
          },
        ],
      },
    };
  }
  const parsed = readingSchema.safeParse(raw);
  if (!parsed.success) {
    const fields = fieldErrors(parsed.error, prefix);
    return {
      rejected: {
        code: 'InvalidReading',
        reason: `The reading has invalid fields: ${fields.map((f) => f.field).join(', ')}.`,
        fields,
      },
    };
  }
  const r = parsed.data;
  const ts = typeof r.ts === 'number' ? r.ts : Date.parse(r.ts);
  if (r.layersC.length !== ctx.tank.sensorCount) {
    return {
      rejected: {
        code: 'LayerCountMismatch',
        reason: `layersC has ${r.layersC.length} temperatures but tank ${ctx.tank.serial} has ${ctx.tank.sensorCount} sensors.`,
        fields: [
          {
            field: `${prefix}layersC`,
            message: `must have exactly ${ctx.tank.sensorCount} temperatures, bottom to top.`,
          },
        ],
      },
    };
  }
  if (ts > ctx.now + limits.futureSkewMs) {
    return {
      rejected: {
        code: 'TimestampInFuture',
        reason: `ts ${new Date(ts).toISOString()} is ahead of the server clock by more than ${limits.futureSkewMs / 60_000} minutes; check the device clock.`,
        fields: [{ field: `${prefix}ts`, message: 'is in the future.' }],
      },
    };
  }
  if (ts < ctx.now - ctx.retentionDays * 86_400_000) {
    return {
      rejected: {
        code: 'TimestampTooOld',
        reason: `ts ${new Date(ts).toISOString()} is older than the ${ctx.retentionDays}-day window readings are kept for.`,
        fields: [{ field: `${prefix}ts`, message: `is older than ${ctx.retentionDays} days.` }],
      },
    };
  }
  const reading: Reading = { ts, layersC: r.layersC };
  if (r.flowC !== undefined) reading.flowC = r.flowC;
  if (r.returnC !== undefined) reading.returnC = r.returnC;
  if (r.compressor !== undefined) reading.compressor = r.compressor;
  if (r.immersionW !== undefined) reading.immersionW = r.immersionW;
  if (r.powerW !== undefined) reading.powerW = r.powerW;
  if (r.solarSurplusW !== undefined) reading.solarSurplusW = r.solarSurplusW;
  if (r.pumpPct !== undefined) reading.pumpPct = r.pumpPct;
  if (r.drawLpm !== undefined) reading.drawLpm = r.drawLpm;
  if (r.seq !== undefined) reading.seq = r.seq;
  return { reading };
}

/**
 * Parses a telemetry payload (one reading, or a batch `{ readings: [...] }`). The whole payload is
 * refused when it is not JSON, too large, or neither shape; otherwise each reading stands alone:
 * valid ones are returned, invalid ones listed with their reason, so one bad reading in a backlog
 * does not cost the rest.
 */
export function parseTelemetry(payload: Buffer | string, ctx: ParseContext): ParsedTelemetry {
  const bytes = typeof payload === 'string' ? Buffer.byteLength(payload) : payload.length;
  if (bytes > limits.maxPayloadBytes) {
    return {
      ok: false,
      code: 'PayloadTooLarge',
      reason: `The payload is ${bytes} bytes; at most ${limits.maxPayloadBytes} are accepted. Send the backlog in several batches.`,
      fields: [{ field: '(body)', message: `must be at most ${limits.maxPayloadBytes} bytes.` }],
    };
  }
  let body: unknown;
  try {
    body = JSON.parse(typeof payload === 'string' ? payload : payload.toString('utf8'));
  } catch (err) {
    return {
      ok: false,
      code: 'InvalidJson',
      reason: `The payload is not valid JSON (${err instanceof Error ? err.message : String(err)}).`,
      fields: [{ field: '(body)', message: 'must be valid JSON.' }],
    };
  }
  if (typeof body !== 'object' || body === null || Array.isArray(body)) {
    return {
      ok: false,
      code: 'InvalidEnvelope',
      reason: 'The payload must be a JSON object: one reading, or { "readings": [ … ] }.',
      fields: [{ field: '(body)', message: 'must be a reading object or { readings: [...] }.' }],
    };
  }
  const obj = body as Record<string, unknown>;
  if (typeof obj.serial === 'string' && obj.serial !== ctx.tank.serial) {
    return {
      ok: false,
      code: 'SerialMismatch',
      reason: `The payload names tank ${obj.serial}, but it was sent with the credentials of ${ctx.tank.serial}.`,
      fields: [{ field: 'serial', message: `must be ${ctx.tank.serial} or left out.` }],
    };
  }
  if (!('readings' in obj)) {
    const one = parseReading(obj, ctx, null);
    return 'reading' in one
      ? { ok: true, batch: false, readings: [one.reading], rejected: [] }
      : { ok: true, batch: false, readings: [], rejected: [{ ...one.rejected, index: 0, raw: obj }] };
  }
  if (Array.isArray(obj.readings) && obj.readings.length > limits.maxBatch) {
    return {
      ok: false,
      code: 'BatchTooLarge',
      reason: `The batch has ${obj.readings.length} readings; at most ${limits.maxBatch} are accepted in one batch.`,
      fields: [{ field: 'readings', message: `must hold at most ${limits.maxBatch} readings.` }],
    };
  }
  const batch = batchSchema.safeParse(obj);
  if (!batch.success) {
    const fields = fieldErrors(batch.error);
    return {
      ok: false,
      code: 'InvalidEnvelope',
      reason: `The batch is malformed: ${fields.map((f) => `${f.field} ${f.message}`).join(' ')}`,
      fields,
    };
  }
  const readings: Reading[] = [];
  const rejected: RejectedReading[] = [];
  batch.data.readings.forEach((raw, index) => {
    const one = parseReading(raw, ctx, index);
    if ('reading' in one) readings.push(one.reading);
    else rejected.push({ ...one.rejected, index, raw });
  });
  return { ok: true, batch: true, readings, rejected };
}

// ---- Commands (cloud → device) and replies (device → cloud) ----

const hhmm = z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$/, { error: 'must be a time "HH:MM" (24-hour clock).' });

/** What a person can ask a tank to do. */
export const commandRequestSchema = z.discriminatedUnion(
  'kind',
  [
    z.object({
      kind: z.literal('boost'),
      /** Heat now, whatever the schedule, for this long. */
      minutes: z
        .number()
        .int()
        .min(10, { error: 'minutes must be at least 10.' })
        .max(240, { error: 'minutes must be at most 240 (4 hours).' }),
    }),
    z.object({
      kind: z.literal('set_target'),
      /**
       * Storage target, °C. Below 60 °C the product warns: HSE HSG274 Part 2 asks for stored hot
       * water at 60 °C or above. The upper bound keeps clear of the immersion thermostat and
       * scalding risk at the taps (common practice).
       */
      targetC: z
        .number()
        .min(40, { error: 'targetC must be at least 40 °C.' })
        .max(70, { error: 'targetC must be at most 70 °C.' }),
      hysteresisK: z
        .number()
        .min(2, { error: 'hysteresisK must be at least 2 K.' })
        .max(15, { error: 'hysteresisK must be at most 15 K.' })
        .optional(),
    }),
    z.object({
      kind: z.literal('set_schedule'),
      /** Local-time windows in which the heat pump may heat water; empty: any time. */
      windows: z
        .array(z.object({ from: hhmm, to: hhmm }), { error: 'windows must be a list of { from, to } times.' })
        .max(6, { error: 'windows can have at most 6 entries.' }),
      /**
       * Litres of mixed water at 40 °C to keep at least (a charge plan's comfort floor): outside the
       * windows the tank heats anyway when it holds less. Optional; without it the windows are strict.
       */
      comfortFloorL40: z
        .number({ error: 'comfortFloorL40 must be a number of litres at 40 °C.' })
        .min(0, { error: 'comfortFloorL40 must be 0 L or more.' })
        .max(1000, { error: 'comfortFloorL40 must be at most 1000 L.' })
        .optional(),
    }),
  ],
  { error: 'kind must be one of boost, set_target, set_schedule.' },
);
export type CommandRequest = z.infer<typeof commandRequestSchema>;

/** A command as published on the tank's command topic. */
export const commandMessageSchema = z.object({
  id: z.uuid(),
  issuedAt: z.number().int(),
  /** The device ignores (and rejects) a command it receives after this, epoch ms. */
  expiresAt: z.number().int(),
  command: commandRequestSchema,
});
export type CommandMessage = z.infer<typeof commandMessageSchema>;

/** A device's reply about a command. */
export const commandReplySchema = z.object({
  commandId: z.uuid({ error: 'commandId must be the id of the command.' }),
  state: z.enum(['acknowledged', 'applied', 'rejected'], { error: 'state must be acknowledged, applied or rejected.' }),
  /** Device time of the change, epoch ms. */
  at: z.number().int().optional(),
  detail: z.string().max(500).optional(),
});
export type CommandReply = z.infer<typeof commandReplySchema>;

export { fieldErrors as zodFieldErrors };
