import { installsTemplate } from '../../../../lib/imports/installs-csv';
import { endpoint } from '../../../../lib/server/endpoint';

/** The CSV template for importing existing installs. */
export const GET = endpoint(async () => new Response(installsTemplate(), {
  headers: { 'content-type': 'text/csv; charset=utf-8', 'content-disposition': 'attachment; filename="heatlayer-installs-template.csv"' },
}));
