// What every route must answer to whom: the role matrix (role-matrix.test.ts) walks every file
// under src/pages and fails loudly for a route with no line here. Adding a route = one line.
//
// who:    'anyone' | 'signedIn' | 'device' | a list of roles (written independently of
//         src/lib/server/access.ts on purpose: the test checks that the two agree).
// scope:  how a record id in the path is scoped: 'company' (any of the company's records) or
//         'home' (staff: the company's homes; householders: only their own). Foreign ids: 404.
// params: the kind of sample id for each path parameter, or { fixed } for a literal value.
// ok:     the statuses that count as "let in" when not the defaults (pages: 200 or a redirect
//         elsewhere than sign-in; APIs: 2xx, or 400/409/410/422 for the deliberately empty body).
// endsSession: the call ends the caller's sessions, so each role calls it from a throwaway
//         account's fresh session (never the shared demo accounts' sessions).
import type { Role } from '../../../src/db/schema/companies';

// tank: a seeded tank of the home; spareTank: a fresh tank in that home (for routes that change it).
export type SampleKind = 'home' | 'tank' | 'spareTank' | 'invitation' | 'member' | 'commissioning';
export type Who = 'anyone' | 'signedIn' | 'device' | readonly Role[];
export interface MethodExpectation {
  who: Who;
  scope?: 'company' | 'home';
  body?: unknown;
  ok?: readonly number[];
  endsSession?: true;
}
export type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
export interface RouteExpectation {
  params?: Record<string, SampleKind | { fixed: string }>;
  methods: Partial<Record<Method, MethodExpectation>>;
}

const admin = ['admin'] as const;
const desk = ['admin', 'operator'] as const;
const staff = ['admin', 'operator', 'engineer'] as const;
const everyone = ['admin', 'operator', 'engineer', 'householder'] as const;
const householder = ['householder'] as const;

export const routeExpectations: Record<string, RouteExpectation> = {
  // pages
  '/': { methods: { GET: { who: 'anyone' } } },
  '/404': { methods: { GET: { who: 'anyone', ok: [404] } } },
  '/signin': { methods: { GET: { who: 'anyone' } } },
  '/forgot-password': { methods: { GET: { who: 'anyone' } } },
  // Without a token these pages say the link is not valid, with 404.
  '/reset-password': { methods: { GET: { who: 'anyone', ok: [404] } } },
  '/accept-invitation': { methods: { GET: { who: 'anyone', ok: [404] } } },
  '/admin': { methods: { GET: { who: admin } } },
  '/admin/staff': { methods: { GET: { who: admin } } },
  '/admin/audit': { methods: { GET: { who: admin } } },
  '/dev/mail': { methods: { GET: { who: admin } } },
  '/homes/[id]/householders': { params: { id: 'home' }, methods: { GET: { who: staff, scope: 'home' } } },
  '/homes/[id]/tariff': { params: { id: 'home' }, methods: { GET: { who: staff, scope: 'home' } } },
  '/homes/[id]/cold-water': { params: { id: 'home' }, methods: { GET: { who: staff, scope: 'home' } } },
  '/fleet': { methods: { GET: { who: desk } } },
  '/fleet/energy': { methods: { GET: { who: desk } } },
  '/tanks': { methods: { GET: { who: staff } } },
  '/tanks/[id]': { params: { id: 'tank' }, methods: { GET: { who: staff, scope: 'home' } } },
  '/home': { methods: { GET: { who: householder } } },

  // endpoints
  '/api/health': { methods: { GET: { who: 'anyone' } } },
  '/api/auth/[...auth]': {
    params: { auth: { fixed: 'session' } },
    methods: { GET: { who: 'anyone' }, POST: { who: 'anyone', ok: [302, 400] } },
  },
  '/api/me': { methods: { GET: { who: 'signedIn' } } },
  '/api/me/sessions/revoke': { methods: { POST: { who: 'signedIn', endsSession: true } } },
  '/api/password-resets': { methods: { POST: { who: 'anyone' } } },
  '/api/password-resets/complete': { methods: { POST: { who: 'anyone' } } },
  '/api/invitations': { methods: { GET: { who: admin }, POST: { who: admin } } },
  '/api/invitations/accept': { methods: { POST: { who: 'anyone' } } },
  '/api/invitations/[id]': { params: { id: 'invitation' }, methods: { DELETE: { who: admin, scope: 'company' } } },
  '/api/members/[id]': {
    params: { id: 'member' },
    methods: { PATCH: { who: admin, scope: 'company' }, DELETE: { who: admin, scope: 'company' } },
  },
  '/api/homes/[id]': {
    params: { id: 'home' },
    methods: { GET: { who: staff, scope: 'home' }, PATCH: { who: ['admin', 'engineer'], scope: 'home' } },
  },
  '/api/homes/[id]/invitations': {
    params: { id: 'home' },
    methods: { GET: { who: staff, scope: 'home' }, POST: { who: staff, scope: 'home' } },
  },
  '/api/audit': { methods: { GET: { who: admin } } },
  '/api/ingest': { methods: { POST: { who: 'device' } } },
  '/api/fleet/summary': { methods: { GET: { who: desk } } },
  '/api/tanks': { methods: { GET: { who: staff } } },
  '/api/tanks/[id]': { params: { id: 'tank' }, methods: { GET: { who: everyone, scope: 'home' } } },
  '/api/tanks/[id]/readings': { params: { id: 'tank' }, methods: { GET: { who: everyone, scope: 'home' } } },
  '/api/tanks/[id]/events': { params: { id: 'tank' }, methods: { GET: { who: staff, scope: 'home' } } },
  '/api/tanks/[id]/export.csv': { params: { id: 'tank' }, methods: { GET: { who: staff, scope: 'home' } } },
  '/api/tanks/[id]/commands': {
    params: { id: 'spareTank' },
    methods: { GET: { who: everyone, scope: 'home' }, POST: { who: everyone, scope: 'home' } },
  },
  '/api/tanks/[id]/device-token': { params: { id: 'spareTank' }, methods: { POST: { who: admin, scope: 'home' } } },

  // commissioning, handover and service records (ids that name nothing answer 404 to those let in)
  '/commissioning': { methods: { GET: { who: staff } } },
  '/commissioning/[id]': { params: { id: 'commissioning' }, methods: { GET: { who: staff, scope: 'company' } } },
  '/commissioning/import': { methods: { GET: { who: admin } } },
  '/admin/heat-pumps': { methods: { GET: { who: admin } } },
  '/service': { methods: { GET: { who: staff } } },
  '/service/tanks/[id]': { params: { id: 'tank' }, methods: { GET: { who: staff, scope: 'home' } } },
  '/api/commissioning': { methods: { GET: { who: staff }, POST: { who: ['admin', 'engineer'] } } },
  '/api/commissioning/[id]': {
    params: { id: 'commissioning' },
    methods: { GET: { who: staff, scope: 'company' }, PATCH: { who: ['admin', 'engineer'], scope: 'company' } },
  },
  '/api/commissioning/[id]/registration': {
    params: { id: 'commissioning' },
    methods: { POST: { who: ['admin', 'engineer'], scope: 'company' } },
  },
  '/api/commissioning/[id]/connection': {
    params: { id: 'commissioning' },
    methods: { GET: { who: staff, scope: 'company' } },
  },
  '/api/commissioning/[id]/sign-off': {
    params: { id: 'commissioning' },
    methods: { POST: { who: ['admin', 'engineer'], scope: 'company' } },
  },
  '/api/commissioning/[id]/record.pdf': {
    params: { id: 'commissioning' },
    methods: { GET: { who: staff, scope: 'company' } },
  },
  '/api/commissioning/[id]/amendments': {
    params: { id: 'commissioning' },
    methods: { POST: { who: ['admin', 'engineer'], scope: 'company' } },
  },
  '/api/commissioning/heat-pump-models': { methods: { GET: { who: staff }, POST: { who: admin } } },
  '/api/commissioning/heat-pump-models/[id]': {
    params: { id: { fixed: '00000000-0000-4000-8000-000000000000' } },
    methods: { DELETE: { who: admin, ok: [404] } },
  },
  '/api/uploads': { methods: { POST: { who: staff } } },
  '/alerts': { methods: { GET: { who: staff } } },
  '/alerts/preferences': { methods: { GET: { who: 'signedIn' } } },
  '/admin/alert-settings': { methods: { GET: { who: admin } } },
  '/admin/tariffs': { methods: { GET: { who: admin } } },
  '/api/alerts': { methods: { GET: { who: staff } } },
  '/api/alerts/acknowledge': { methods: { POST: { who: staff } } },
  '/api/alerts/[id]': {
    params: { id: { fixed: '00000000-0000-4000-8000-000000000000' } },
    methods: { GET: { who: staff, ok: [404] }, PATCH: { who: staff } },
  },
  '/api/alerts/thresholds': { methods: { GET: { who: admin }, PUT: { who: admin } } },
  '/api/alerts/preferences': { methods: { GET: { who: 'signedIn' }, PUT: { who: 'signedIn' } } },
  '/api/uploads/[id]': {
    params: { id: { fixed: '00000000-0000-4000-8000-000000000000' } },
    methods: { GET: { who: everyone, ok: [404] } },
  },
  '/api/visits': { methods: { GET: { who: staff }, POST: { who: staff } } },
  '/api/visits/[id]': {
    params: { id: { fixed: '00000000-0000-4000-8000-000000000000' } },
    methods: { GET: { who: staff, ok: [404] } },
  },
  '/api/imports/installs': { methods: { POST: { who: admin } } },
  '/api/imports/installs/preview': { methods: { POST: { who: admin } } },
  '/api/imports/installs/template.csv': { methods: { GET: { who: admin } } },
  // The empty body is refused (400: homeId must be given, null for a company default); plans answer 409 while there is no tariff or no layers.
  '/api/tariffs': { methods: { GET: { who: staff }, POST: { who: staff } } },
  '/api/tanks/[id]/energy': { params: { id: 'tank' }, methods: { GET: { who: everyone, scope: 'home' } } },
  '/api/tanks/[id]/plan': { params: { id: 'tank' }, methods: { POST: { who: everyone, scope: 'home' } } },
  '/api/tanks/[id]/plan/send': { params: { id: 'spareTank' }, methods: { POST: { who: everyone, scope: 'home' } } },
  '/api/fleet/energy': { methods: { GET: { who: desk } } },
};
