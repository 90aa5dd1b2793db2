import contentDisposition from 'content-disposition';
import { recordPdf } from '../../../../lib/commissioning/flow.server';
import { HttpError, requireViewer } from '../../../../lib/server/authz';
import { endpoint } from '../../../../lib/server/endpoint';

/** The signed record's PDF, as sent to the householder. */
export const GET = endpoint(async ({ locals, params }) => {
  const viewer = requireViewer(locals);
  const pdf = await recordPdf(viewer, params.id ?? '');
  if (!pdf) throw new HttpError(404, 'NotFound', 'This record has no PDF yet: it is made at sign-off.');
  return new Response(new Uint8Array(pdf.bytes), {
    headers: {
      'content-type': 'application/pdf',
      'content-disposition': contentDisposition(`commissioning-record-${pdf.serial}.pdf`, { type: 'inline' }),
      'cache-control': 'private, no-store',
    },
  });
});
