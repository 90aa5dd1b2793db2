import { homeLabel, homeSettings } from '../../../../db/queries/home-access';
import { homeSettingsBody } from '../../../../lib/homes/settings';
import { changeColdInlet } from '../../../../lib/homes/settings.server';
import { HttpError, requireViewer, scopeOf } from '../../../../lib/server/authz';
import { jsonBody } from '../../../../lib/server/body';
import { endpoint } from '../../../../lib/server/endpoint';
import { json } from '../../../../lib/server/http';
import { EN16147_COLD_C } from '../../../../lib/thermal';

const notFound = () => new HttpError(404, 'NotFound', 'There is no home with that id in your company.');

/** GET /api/homes/{id}: the home and the cold water its figures count from. */
export const GET = endpoint(async ({ locals, params }) => {
  const viewer = requireViewer(locals);
  const home = await homeSettings(scopeOf(viewer), params.id ?? '');
  if (!home) throw notFound();
  return json({
    id: home.id,
    reference: home.reference,
    label: homeLabel(home),
    coldInletC: home.coldInletC,
    coldWaterC: home.coldInletC ?? EN16147_COLD_C,
    coldWaterFrom: home.coldInletC === null ? 'EN 16147' : 'home',
  });
});

/**
 * PATCH /api/homes/{id} `{ coldInletC: number | null }` (admins and engineers): the home's measured
 * cold-inlet temperature, or null to count from EN 16147's 10 °C again. Its tanks' latest figures
 * are recomputed at once.
 */
export const PATCH = endpoint(async ({ locals, params, request }) => {
  const viewer = requireViewer(locals, ['admin', 'engineer']); // as access.ts lists
  const scope = scopeOf(viewer);
  // The home first: another company's id is "not found" whatever the body says.
  if (!(await homeSettings(scope, params.id ?? ''))) throw notFound();
  const { coldInletC } = await jsonBody(request, homeSettingsBody);
  const change = await changeColdInlet(scope, viewer.userId, params.id ?? '', coldInletC);
  if (!change) throw notFound();
  return json(change);
});
