import type { Role } from '../../db/schema/companies';
import { staffRoles } from '@/db/schema/companies';

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

const staff = staffRoles;
const desk = ['admin', 'operator'] as const;
const everyone = ['admin', 'operator', 'engineer', 'householder'] as const;

export const routeAccess: Record<string, Partial<Record<Method, AccessRule>>> = {
  // pages
  '/': { GET: 'public' },
  '/signin': { GET: 'public' },
  '/404': { GET: 'public' },
  // accounts: signing in, invitations, resets; company administration
  '/forgot-password': { GET: 'public' },
  '/reset-password': { GET: 'public' },
  '/accept-invitation': { GET: 'public' },
  '/admin': { GET: ['admin'] },
  '/admin/staff': { GET: ['admin'] },
  '/admin/audit': { GET: ['admin'] },
  '/dev/mail': { GET: ['admin'] },
  '/homes/[id]/householders': { GET: staff },
  '/homes/[id]/tariff': { GET: staff },
  '/homes/[id]/cold-water': { GET: staff },
  // views: fleet triage, one tank in depth, hot water at home
  '/fleet': { GET: desk },
  '/fleet/energy': { GET: desk },
  '/tanks': { GET: staff },
  '/tanks/[id]': { GET: staff },
  '/home': { GET: ['householder'] },
  // commissioning, handover and service records
  '/commissioning': { GET: staff },
  '/commissioning/[id]': { GET: staff },
  '/commissioning/import': { GET: ['admin'] },
  '/admin/heat-pumps': { GET: ['admin'] },
  '/service': { GET: staff },
  '/service/tanks/[id]': { GET: staff },
  // alerts: the staff inbox, householders' notice setting, thresholds
  '/alerts': { GET: staff },
  '/alerts/preferences': { GET: 'signedIn' },
  '/admin/alert-settings': { GET: ['admin'] },
  '/admin/tariffs': { GET: ['admin'] },
  // endpoints
  '/api/health': { GET: 'public' },
  '/api/auth/[...auth]': { GET: 'public', POST: 'public' },
  '/api/me': { GET: 'signedIn' },
  '/api/me/sessions/revoke': { POST: 'signedIn' },
  '/api/password-resets': { POST: 'public' },
  '/api/password-resets/complete': { POST: 'public' },
  '/api/invitations': { GET: ['admin'], POST: ['admin'] },
  '/api/invitations/accept': { POST: 'public' },
  '/api/invitations/[id]': { DELETE: ['admin'] },
  '/api/members/[id]': { PATCH: ['admin'], DELETE: ['admin'] },
  '/api/homes/[id]': { GET: staff, PATCH: ['admin', 'engineer'] },
  '/api/homes/[id]/invitations': { GET: staff, POST: staff },
  '/api/audit': { GET: ['admin'] },
  '/api/ingest': { POST: 'device' },
  '/api/tanks/[id]/device-token': { POST: ['admin'] },
  '/api/tanks/[id]/commands': { GET: everyone, POST: everyone },
  '/api/tanks': { GET: staff },
  '/api/tanks/[id]': { GET: everyone },
  '/api/tanks/[id]/readings': { GET: everyone },
  '/api/tanks/[id]/events': { GET: staff },
  '/api/tanks/[id]/export.csv': { GET: staff },
  '/api/fleet/summary': { GET: desk },
  '/api/alerts': { GET: staff },
  '/api/alerts/acknowledge': { POST: staff },
  '/api/alerts/[id]': { GET: staff, PATCH: staff },
  '/api/alerts/thresholds': { GET: ['admin'], PUT: ['admin'] },
  '/api/alerts/preferences': { GET: 'signedIn', PUT: 'signedIn' },
  '/api/commissioning': { GET: staff, POST: ['admin', 'engineer'] },
  '/api/commissioning/[id]': { GET: staff, PATCH: ['admin', 'engineer'] },
  '/api/commissioning/[id]/registration': { POST: ['admin', 'engineer'] },
  '/api/commissioning/[id]/connection': { GET: staff },
  '/api/commissioning/[id]/sign-off': { POST: ['admin', 'engineer'] },
  '/api/commissioning/[id]/record.pdf': { GET: staff },
  '/api/commissioning/[id]/amendments': { POST: ['admin', 'engineer'] },
  '/api/commissioning/heat-pump-models': { GET: staff, POST: ['admin'] },
  '/api/commissioning/heat-pump-models/[id]': { DELETE: ['admin'] },
  '/api/uploads': { POST: staff },
  '/api/uploads/[id]': { GET: everyone },
  '/api/visits': { GET: staff, POST: staff },
  '/api/visits/[id]': { GET: staff },
  '/api/imports/installs': { POST: ['admin'] },
  '/api/imports/installs/preview': { POST: ['admin'] },
  '/api/imports/installs/template.csv': { GET: ['admin'] },
  // energy: tariffs (company defaults for admins, a home's for staff), cost accounting, charge planning
  '/api/tariffs': { GET: staff, POST: staff },
  '/api/tanks/[id]/energy': { GET: everyone },
  '/api/tanks/[id]/plan': { POST: everyone },
  '/api/tanks/[id]/plan/send': { POST: everyone },
  '/api/fleet/energy': { GET: desk },
};

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
