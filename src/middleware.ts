import { defineMiddleware, sequence } from 'astro:middleware';
import { viewerForSession } from './db/queries/accounts';
import { csrfTokenFor } from './lib/auth/handler';
import { clearSessionCookie, getSession } from './lib/auth/session';
import { accessFor, allows } from './lib/server/access';
import { problem } from './lib/server/http';
import { isCrossSite, isHttps } from './lib/server/request';

/**
 * Session → Astro.locals.viewer: the Auth.js session cookie, its server-side record (ended by
 * signing out), then the person's role read fresh. A cookie whose session has ended is dropped.
 */
const loadViewer = defineMiddleware(async (context, next) => {
  context.locals.viewer = null;
  const secure = isHttps(context);
  const session = await getSession(context.cookies, secure);
  if (session) {
    context.locals.viewer = await viewerForSession(session.userId, session.sessionId);
    if (!context.locals.viewer) clearSessionCookie(context.cookies, secure);
  }
  return next();
});

/** Deny by default: every route must be listed in src/lib/server/access.ts. */
const guardRoute = defineMiddleware(async (context, next) => {
  const isApi = context.url.pathname.startsWith('/api/');
  const rule = accessFor(context.routePattern, context.request.method);
  if (!rule) {
    return isApi ? problem(404, 'NotFound', 'There is no such endpoint.') : context.rewrite('/404');
  }
  // Cross-site writes are refused whoever is signed in (Astro itself refuses cross-site form
  // posts; this covers JSON too). Devices authenticate with a bearer token, not cookies.
  const method = context.request.method.toUpperCase();
  if (isApi && rule !== 'device' && !['GET', 'HEAD', 'OPTIONS'].includes(method) && isCrossSite(context)) {
    return problem(
      403,
      'CrossSiteRequest',
      'This request came from another site and was refused. Use Heatlayer from its own pages.',
    );
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

/** Pages that post to Auth.js (sign-in, and sign-out in the shell) need its CSRF token. */
const csrfForPages = defineMiddleware(async (context, next) => {
  const isPage = !context.url.pathname.startsWith('/api/') && context.request.method === 'GET';
  if (isPage) context.locals.csrfToken = await csrfTokenFor(context);
  return next();
});

export const onRequest = sequence(loadViewer, guardRoute, csrfForPages);
