/// <reference types="astro/client" />

declare namespace App {
  interface Locals {
    /** Filled by src/middleware.ts from the Auth.js session; null when signed out. */
    viewer: import('./lib/server/viewer').Viewer | null;
    /** Auth.js's CSRF token for forms that post to /api/auth (pages only). */
    csrfToken?: string;
  }
}
