import contentDisposition from 'content-disposition';
import { findUploadInScope } from '../../../db/queries/commissioning';
import { HttpError, requireViewer, scopeOf } from '../../../lib/server/authz';
import { endpoint } from '../../../lib/server/endpoint';
import { getObject } from '../../../lib/storage/objects.server';

/** A stored photo or document; another company's (or another home's) is "not found". */
export const GET = endpoint(async ({ locals, params }) => {
  const viewer = requireViewer(locals);
  const upload = await findUploadInScope(scopeOf(viewer), params.id ?? '');
  if (!upload) throw new HttpError(404, 'NotFound', 'There is no such photo or document.');
  const bytes = await getObject(upload.storageKey);
  if (!bytes) throw new HttpError(404, 'NotFound', 'This file is no longer in storage.');
  return new Response(new Uint8Array(bytes), {
    headers: {
      'content-type': upload.contentType,
      // Any name people give their files (RFC 6266 with an RFC 5987 UTF-8 filename*).
      'content-disposition': contentDisposition(upload.filename, { type: 'inline' }),
      'cache-control': 'private, max-age=3600',
      'x-content-type-options': 'nosniff',
    },
  });
});
