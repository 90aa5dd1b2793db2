import contentDisposition from 'content-disposition';
import { installsTemplate } from '../../../../lib/imports/installs-csv';
import { endpoint } from '../../../../lib/server/endpoint';

/** The CSV template for importing existing installs. */
export const GET = endpoint(
  async () =>
    new Response(installsTemplate(), {
      headers: {
        'content-type': 'text/csv; charset=utf-8',
        'content-disposition': contentDisposition('heatlayer-installs-template.csv'),
      },
    }),
);
