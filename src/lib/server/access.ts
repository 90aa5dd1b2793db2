import type { Role } from '../../db/schema/companies';

/**
 * Who may use each route, by Astro route pattern and HTTP method. Deny by default: a page or
 * endpoint missing here answers 404 to everyone (the role-matrix test fails on any file under
 * src/pages that is not listed). Per-record scope (company, home) is checked by the queries.
 *
 * - 'public': anyone, signed in or not
 * - 'device': a tank's own bearer token, checked by the endpoint itself
 * - 'signedIn': any signed-in person, whatever their role
 * - a list of roles: signed-in people holding one of them
 */
export type AccessRule = 'public' | 'device' | 'signedIn' | readonly Role[];
export type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';

const staff = ['admin', 'operator', 'engineer'] as const;
const desk = ['admin', 'operator'] as const;
const everyone = ['admin', 'operator', 'engineer', 'householder'] as const;

export const routeAccess: Record<string, Partial<Record<Method, AccessRule>>> = {
  // pages
  '/': { GET: 'public' },
  '/signin': { GET: 'public' },
  '/404': { GET: 'public' },
  // endpoints
  '/api/health': { GET: 'public' },
  '/api/auth/[...auth]': { GET: 'public', POST: 'public' },
  '/api/me': { GET: 'signedIn' },
  '/api/ingest': { POST: 'device' },
  '/api/tanks/[id]/device-token': { POST: ['admin'] },
  '/api/tanks/[id]/commands': { GET: everyone, POST: everyone },
};

export { desk, everyone, staff };

/** The rule for a route and method, or undefined when the route does not allow it. */
export function accessFor(routePattern: string, method: string): AccessRule | undefined {
  const m = method.toUpperCase() === 'HEAD' ? 'GET' : (method.toUpperCase() as Method);
  return routeAccess[routePattern]?.[m];
}

export function allows(rule: AccessRule, role: Role | undefined): boolean {
  if (rule === 'public' || rule === 'device') return true;
  if (!role) return false;
  if (rule === 'signedIn') return true;
  return rule.includes(role);
}
