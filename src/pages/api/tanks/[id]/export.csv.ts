import contentDisposition from 'content-disposition';
import { requireTank, requireViewer, scopeOf } from '../../../../lib/server/authz';
import { endpoint } from '../../../../lib/server/endpoint';
import { rangeQuerySchema, searchParams } from '../../../../lib/views/contracts';
import { readingsCsv } from '../../../../lib/views/csv';
import { tankSeries } from '../../../../lib/views/tank-series.server';
import { getTank } from '../../../../db/queries/tanks';
import { staffRoles } from '@/db/schema/companies';

/** GET /api/tanks/{id}/export.csv?from&to&resolution&since: the same range as the readings API, as CSV. */
export const GET = endpoint(async ({ locals, params, url }) => {
  const viewer = requireViewer(locals, staffRoles);
  const tank = await requireTank(getTank, scopeOf(viewer), params.id);
  const range = rangeQuerySchema.parse(searchParams(url));
  const series = await tankSeries(tank, range);
  const name =
    `${tank.serial}_${range.from.toISOString().slice(0, 16)}_${range.to.toISOString().slice(0, 16)}_${range.resolution}.csv`.replace(
      /:/g,
      '',
    );
  return new Response(readingsCsv(series, tank.serial), {
    headers: {
      'content-type': 'text/csv; charset=utf-8',
      'content-disposition': contentDisposition(name),
      'cache-control': 'no-store',
    },
  });
});
