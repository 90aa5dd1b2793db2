import type { APIContext, APIRoute } from 'astro';
import { ZodError } from 'zod';
import { HttpError } from './authz';
import { problem } from './http';

/**
 * Wraps an endpoint handler: expected failures (HttpError, zod validation) become JSON problem
 * answers with the failing fields; anything else is logged once here and answered as a plain 500
 * that leaks nothing.
 */
export function endpoint(handler: (context: APIContext) => Promise<Response>): APIRoute {
  return async (context) => {
    try {
      return await handler(context);
    } catch (err) {
      if (err instanceof HttpError) return problem(err.status, err.code, err.message, err.fields);
      if (err instanceof ZodError) {
        return problem(400, 'InvalidRequest', 'The request has invalid fields; see "fields".',
          err.issues.map((i) => ({ field: i.path.join('.') || '(body)', message: i.message })));
      }
      console.error(`[api] ${context.request.method} ${context.url.pathname} failed:`, err);
      return problem(500, 'InternalError', 'Something went wrong on our side. It has been logged; please try again.');
    }
  };
}
