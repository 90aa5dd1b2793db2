import type { z } from 'zod';
import { HttpError } from './authz';

/**
 * The request's JSON body checked against a schema: 400 naming the fields when it does not fit
 * (the endpoint wrapper turns the ZodError into that answer).
 */
export async function jsonBody<S extends z.ZodTypeAny>(request: Request, schema: S): Promise<z.infer<S>> {
  let raw: unknown;
  try {
    raw = await request.json();
  } catch {
    throw new HttpError(400, 'InvalidJson', 'The request body must be a JSON object.', [{ field: '(body)', message: 'Not valid JSON.' }]);
  }
  return schema.parse(raw);
}
