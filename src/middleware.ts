import { defineMiddleware, sequence } from 'astro:middleware';

// Session → Astro.locals.viewer. Route guards are added by the accounts module.
const loadViewer = defineMiddleware(async (context, next) => {
  context.locals.viewer = null;
  return next();
});

export const onRequest = sequence(loadViewer);
