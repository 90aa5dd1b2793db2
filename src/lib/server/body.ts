import type { z } from '@/lib/zod';
import { HttpError } from './authz';
import { textProblem } from './text';

/**
 * The most any JSON API body may hold. The largest real one (a service visit with 50 parts and
 * 5,000 characters of findings, or 500 alert ids to acknowledge) is under 40 KiB; 256 KiB leaves
 * room for growth while a flood of oversized requests cannot take the web process's memory.
 * Telemetry ingest and file uploads have limits of their own.
 */
export const MAX_JSON_BODY_BYTES = 256 * 1024;

/**
 * Reads the whole body, refusing it with `tooLarge()` once it passes `maxBytes`: at once when
 * Content-Length says so, otherwise as soon as the streamed bytes do (nothing more is read).
 */
export async function readBoundedBody(request: Request, maxBytes: number, tooLarge: () => HttpError): Promise<Buffer> {
  const declared = Number(request.headers.get('content-length') ?? 'NaN');
  if (Number.isFinite(declared) && declared > maxBytes) throw tooLarge();
  if (!request.body) return Buffer.alloc(0);
  const chunks: Buffer[] = [];
  let size = 0;
  const reader = request.body.getReader();
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    size += value.byteLength;
    if (size > maxBytes) {
      await reader.cancel().catch(() => undefined);
      throw tooLarge();
    }
    chunks.push(Buffer.from(value));
  }
  return Buffer.concat(chunks);
}

const jsonTooLarge = () =>
  new HttpError(
    413,
    'BodyTooLarge',
    `The request body is larger than the ${MAX_JSON_BODY_BYTES / 1024} KiB a JSON request may hold.`,
    [{ field: '(body)', message: `At most ${MAX_JSON_BODY_BYTES / 1024} KiB.` }],
  );

/** The first string (key or value) in a parsed JSON value that is not acceptable text, with its path. */
function badText(value: unknown, path: string): { field: string; message: string } | null {
  if (typeof value === 'string') {
    const problem = textProblem(value);
    return problem ? { field: path || '(body)', message: problem } : null;
  }
  if (Array.isArray(value)) {
    for (let i = 0; i < value.length; i++) {
      const bad = badText(value[i], path ? `${path}.${i}` : String(i));
      if (bad) return bad;
    }
    return null;
  }
  if (value && typeof value === 'object') {
    for (const [k, v] of Object.entries(value)) {
      const field = path ? `${path}.${k}` : k;
      const keyProblem = textProblem(k);
      if (keyProblem) return { field: path || '(body)', message: `has a field name that ${keyProblem}` };
      const bad = badText(v, field);
      if (bad) return bad;
    }
  }
  return null;
}

/**
 * The request's JSON body, read through the one bounded reader: 413 over MAX_JSON_BODY_BYTES,
 * 400 when it is not JSON or a text field holds what PostgreSQL cannot store (NUL, broken
 * UTF-16) or control characters. An empty body is `emptyAs` when given, otherwise 400.
 */
async function readJson(request: Request, options: { emptyAs?: unknown } = {}): Promise<unknown> {
  const text = (await readBoundedBody(request, MAX_JSON_BODY_BYTES, jsonTooLarge)).toString('utf8');
  if (!text.trim() && 'emptyAs' in options) return options.emptyAs;
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch {
    throw new HttpError(400, 'InvalidJson', 'The request body must be JSON.', [
      { field: '(body)', message: 'Not valid JSON.' },
    ]);
  }
  const bad = badText(raw, '');
  if (bad) throw new HttpError(400, 'InvalidText', `${bad.field} ${bad.message}`, [bad]);
  return raw;
}

/**
 * The request's JSON body checked against a schema: 400 naming the fields when it does not fit
 * (the endpoint wrapper turns the ZodError into that answer). Every JSON route reads its body so.
 */
export async function jsonBody<S extends z.ZodType>(
  request: Request,
  schema: S,
  options: { emptyAs?: unknown } = {},
): Promise<z.output<S>> {
  return schema.parse(await readJson(request, options));
}
