import { HttpError, requireViewer, scopeOf } from '../../../lib/server/authz';
import { jsonBody } from '../../../lib/server/body';
import { endpoint } from '../../../lib/server/endpoint';
import { json } from '../../../lib/server/http';
import { csvFromRequest } from '../../../lib/imports/installs.server';
import { tariffCsvQuery, tariffJsonBody } from '../../../lib/tank-energy/contracts';
import { storeTariff, tariffOwner, tariffRefusal, tariffsVisible } from '../../../lib/tank-energy/energy.server';
import { tariffFromCsv, tariffFromJson } from '../../../lib/tank-energy/tariff-upload';

/** GET /api/tariffs?homeId: the company's default tariffs and, with homeId, that home's own. */
export const GET = endpoint(async ({ locals, url }) => {
  const viewer = requireViewer(locals);
  const homeId = url.searchParams.get('homeId') ?? undefined;
  return json({ tariffs: await tariffsVisible(scopeOf(viewer), homeId) });
});

/**
 * POST /api/tariffs. JSON `{ homeId?, tariff: { kind: 'flat' | 'day_night', … } }`, or half-hourly
 * prices as CSV (body `text/csv` or a multipart `file`) with `?homeId&unit&name`. Without homeId
 * it is a company default (admins only). All or nothing: any problem answers 422 with each one.
 */
export const POST = endpoint(async ({ locals, request, url }) => {
  const viewer = requireViewer(locals);
  const scope = scopeOf(viewer);
  const type = request.headers.get('content-type') ?? '';
  if (type.startsWith('application/json')) {
    const body = await jsonBody(request, tariffJsonBody);
    const homeId = await tariffOwner(viewer, scope, body.homeId);
    const parsed = tariffFromJson(body.tariff);
    return parsed.ok ? storeTariff(viewer, homeId, parsed.tariff) : tariffRefusal(parsed.problems);
  }
  if (type.startsWith('text/csv') || type.startsWith('multipart/form-data')) {
    const q = tariffCsvQuery.parse(Object.fromEntries(url.searchParams));
    const homeId = await tariffOwner(viewer, scope, q.homeId);
    const parsed = tariffFromCsv(await csvFromRequest(request), {
      ...(q.unit ? { unit: q.unit } : {}),
      ...(q.name ? { name: q.name } : {}),
      negativeImportAllowed: q.negativeImportAllowed === 'true',
    });
    return parsed.ok ? storeTariff(viewer, homeId, parsed.tariff) : tariffRefusal(parsed.problems);
  }
  throw new HttpError(
    415,
    'UnsupportedMediaType',
    'Send a tariff as JSON (flat or day/night) or half-hourly prices as CSV (text/csv or a multipart file).',
    [{ field: '(body)', message: 'content-type must be application/json, text/csv or multipart/form-data.' }],
  );
});
