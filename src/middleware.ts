import { defineMiddleware, sequence } from 'astro:middleware';
import { accessFor, allows } from './lib/server/access';
import { problem } from './lib/server/http';

// Session → Astro.locals.viewer (the accounts module replaces this with the Auth.js session).
const loadViewer = defineMiddleware(async (context, next) => {
  context.locals.viewer = null;
  return next();
});

/** Deny by default: every route must be listed in src/lib/server/access.ts. */
const guardRoute = defineMiddleware(async (context, next) => {
  const isApi = context.url.pathname.startsWith('/api/');
  const rule = accessFor(context.routePattern, context.request.method);
  if (!rule) {
    return isApi ? problem(404, 'NotFound', 'There is no such endpoint.') : context.rewrite('/404');
  }
  const role = context.locals.viewer?.role;
  if (!allows(rule, role)) {
    if (!context.locals.viewer) {
      if (isApi) return problem(401, 'SignInRequired', 'Sign in to use this.');
      return context.redirect(`/signin?next=${encodeURIComponent(context.url.pathname + context.url.search)}`);
    }
    return isApi ? problem(403, 'NotAllowedForRole', 'Your role does not allow this.') : context.rewrite('/404');
  }
  return next();
});

export const onRequest = sequence(loadViewer, guardRoute);
