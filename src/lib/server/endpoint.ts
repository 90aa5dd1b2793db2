import type { APIContext, APIRoute } from 'astro';
import { ZodError } from '@/lib/zod';
import { HttpError } from './authz';
import { problem, type FieldError } from './http';
import { textProblem } from './text';

/** The first query parameter that is not acceptable text (NUL, control characters), named. */
function badQueryParameter(url: URL): FieldError | null {
  for (const [key, value] of url.searchParams) {
    const p = textProblem(key) ?? textProblem(value);
    if (p) return { field: key.replace(/[\u0000-\u001F]/g, '?'), message: p };
  }
  return null;
}

/**
 * Wraps an endpoint handler: a failure becomes its answer through `errorAnswer`. Before the handler runs, a query parameter holding control characters is
 * refused (400 naming it) and a path id holding them names nothing (404), so no handler ever
 * passes such text to PostgreSQL, which cannot store NUL.
 */
export function endpoint(handler: (context: APIContext) => Promise<Response>): APIRoute {
  return async (context) => {
    try {
      const badQuery = badQueryParameter(context.url);
      if (badQuery)
        return problem(400, 'InvalidRequest', `The query parameter ${badQuery.field} ${badQuery.message}`, [badQuery]);
      if (Object.values(context.params).some((v) => v !== undefined && textProblem(v))) {
        return problem(404, 'NotFound', 'There is no such record.');
      }
      return await handler(context);
    } catch (err) {
      return errorAnswer(err, `${context.request.method} ${context.url.pathname}`);
    }
  };
}

/**
 * The answer to a failed request: an HttpError or a zod validation as its JSON problem with the
 * failing fields; anything else logged once (naming `what`) and answered as a 500 that leaks nothing.
 */
export function errorAnswer(err: unknown, what: string): Response {
  if (err instanceof HttpError) return problem(err.status, err.code, err.message, err.fields);
  if (err instanceof ZodError) {
    return problem(
      400,
      'InvalidRequest',
      'The request has invalid fields; see "fields".',
      err.issues.map((i) => ({ field: i.path.join('.') || '(body)', message: i.message })),
    );
  }
  console.error(`[api] ${what} failed:`, err);
  return problem(500, 'InternalError', 'Something went wrong on our side. It has been logged; please try again.');
}
