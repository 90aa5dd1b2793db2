import type { Role } from '../../db/schema/companies';
import type { Viewer } from './viewer';

/** An expected failure with its HTTP status; endpoints turn it into a JSON problem answer. */
export class HttpError extends Error {
  constructor(readonly status: number, readonly code: string, message: string, readonly fields?: { field: string; message: string }[]) {
    super(message);
  }
}

/**
 * The signed-in viewer, or an HttpError: 401 when signed out, 403 when the role may not do this.
 * The middleware already enforces the route table; handlers call this to get a typed viewer.
 */
export function requireViewer(locals: App.Locals, roles?: readonly Role[]): Viewer {
  const viewer = locals.viewer;
  if (!viewer) throw new HttpError(401, 'SignInRequired', 'Sign in to use this.');
  if (roles && !roles.includes(viewer.role)) throw new HttpError(403, 'NotAllowedForRole', 'Your role does not allow this.');
  return viewer;
}

/**
 * What a viewer may see: every home of their company, or (householders) only their own homes.
 * Every query that reads or writes company data takes a Scope; a record outside it is "not found".
 */
export interface Scope {
  companyId: string;
  /** null: every home of the company; otherwise only these homes. */
  homeIds: readonly string[] | null;
}

export function scopeOf(viewer: Viewer): Scope {
  return { companyId: viewer.companyId, homeIds: viewer.role === 'householder' ? (viewer.homeIds ?? []) : null };
}
