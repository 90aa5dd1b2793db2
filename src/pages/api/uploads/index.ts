import { randomUUID } from 'node:crypto';
import { getCommissioning, insertUpload } from '../../../db/queries/commissioning';
import { findTankInScope } from '../../../db/queries/telemetry';
import { HttpError, requireTank, requireViewer, scopeOf } from '../../../lib/server/authz';
import { endpoint } from '../../../lib/server/endpoint';
import { json } from '../../../lib/server/http';
import { MAX_UPLOAD_BYTES, prepareUpload, tooLarge } from '../../../lib/storage/files.server';
import { putObject } from '../../../lib/storage/objects.server';
import { staffRoles } from '@/db/schema/companies';

/**
 * Uploads one photo or document (multipart form: `file`, and `commissioningId` or `tankId`).
 * Checked by content, photos downscaled, stored through the S3 API under the company's prefix.
 */
export const POST = endpoint(async ({ locals, request }) => {
  const viewer = requireViewer(locals, staffRoles);
  // Refuse an oversized body before reading it (room for the form's own fields).
  const declared = Number(request.headers.get('content-length') ?? 'NaN');
  if (Number.isFinite(declared) && declared > MAX_UPLOAD_BYTES + 64 * 1024) throw tooLarge('The file', declared);
  let form: FormData;
  try {
    form = await request.formData();
  } catch {
    throw new HttpError(400, 'InvalidUpload', 'Send the file as a multipart form with a “file” field.', [
      { field: 'file', message: 'No file.' },
    ]);
  }
  const file = form.get('file');
  if (!(file instanceof File))
    throw new HttpError(400, 'FileRequired', 'Choose a photo or document to upload.', [
      { field: 'file', message: 'No file chosen.' },
    ]);

  const commissioningId = String(form.get('commissioningId') ?? '') || null;
  let tankId = String(form.get('tankId') ?? '') || null;
  if (!commissioningId && !tankId)
    throw new HttpError(400, 'TargetRequired', 'Say what the file belongs to: commissioningId or tankId.', [
      { field: 'commissioningId', message: 'Missing.' },
    ]);
  if (commissioningId) {
    const c = await getCommissioning(viewer.companyId, commissioningId);
    if (!c) throw new HttpError(404, 'NotFound', 'There is no such commissioning record.');
    if (c.status === 'signed')
      throw new HttpError(
        409,
        'RecordLocked',
        'This commissioning record is signed and locked. Add the photo to the tank’s service history instead.',
      );
    tankId = c.tankId;
  } else {
    await requireTank(findTankInScope, scopeOf(viewer), tankId!);
  }

  const prepared = await prepareUpload(file.name, Buffer.from(await file.arrayBuffer()));
  const storageKey = `${viewer.companyId}/uploads/${randomUUID()}`;
  await putObject(storageKey, prepared.body, prepared.contentType);
  const row = await insertUpload({
    companyId: viewer.companyId,
    commissioningId,
    tankId,
    visitId: null,
    kind: prepared.kind,
    filename: prepared.filename,
    contentType: prepared.contentType,
    bytes: prepared.body.length,
    width: prepared.width,
    height: prepared.height,
    downscaled: prepared.downscaled,
    storageKey,
    uploadedBy: viewer.userId,
  });
  return json(
    {
      upload: {
        id: row.id,
        kind: row.kind,
        filename: row.filename,
        bytes: row.bytes,
        width: row.width,
        height: row.height,
        downscaled: row.downscaled,
        url: `/api/uploads/${row.id}`,
      },
    },
    201,
  );
});
