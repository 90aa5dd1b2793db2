import type { Role } from '../../db/schema/companies';
import type { Viewer } from './viewer';

/** An expected failure with its HTTP status; endpoints turn it into a JSON problem answer. */
export class HttpError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields?: { field: string; message: string }[],
  ) {
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
  if (roles && !roles.includes(viewer.role))
    throw new HttpError(403, 'NotAllowedForRole', 'Your role does not allow this.');
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

/**
 * The tank `find` returns for this id within the scope, or the one 404 every tank route answers:
 * a tank of another company, or of another householder's home, is simply not there.
 */
export async function requireTank<T>(
  find: (scope: Scope, id: string) => Promise<T | null>,
  scope: Scope,
  id: string | undefined,
): Promise<T> {
  const tank = id ? await find(scope, id) : null;
  if (!tank) throw new HttpError(404, 'TankNotFound', 'There is no such tank among the ones you can see.');
  return tank;
}

export function scopeOf(viewer: Viewer): Scope {
  return { companyId: viewer.companyId, homeIds: viewer.role === 'householder' ? (viewer.homeIds ?? []) : null };
}
