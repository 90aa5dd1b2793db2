// Bulk import of existing installs: preview (every problem, nothing stored) and import (all rows
// in one transaction, or none).
import { existingKeys, importInstalls } from '../../db/queries/commissioning';
import { HttpError } from '../server/authz';
import type { Viewer } from '../server/viewer';
import { MAX_IMPORT_BYTES, parseInstalls, type RowError } from './installs-csv';

export interface ImportPreview {
  total: number;
  valid: number;
  errors: RowError[];
}

/** Reads an uploaded CSV body (text/csv, or a multipart form with a `file` field). */
export async function csvFromRequest(request: Request): Promise<string> {
  const declared = Number(request.headers.get('content-length') ?? 'NaN');
  const tooLarge = () =>
    new HttpError(
      413,
      'FileTooLarge',
      `The file is larger than ${MAX_IMPORT_BYTES / 1024 / 1024} MB; split it into smaller files.`,
      [{ field: 'file', message: 'Too large.' }],
    );
  if (Number.isFinite(declared) && declared > MAX_IMPORT_BYTES + 64 * 1024) throw tooLarge();
  const type = request.headers.get('content-type') ?? '';
  let text: string;
  if (type.startsWith('multipart/form-data')) {
    const file = (await request.formData()).get('file');
    if (!(file instanceof File))
      throw new HttpError(400, 'FileRequired', 'Choose the CSV file to import.', [
        { field: 'file', message: 'No file chosen.' },
      ]);
    text = await file.text();
  } else {
    text = await request.text();
  }
  if (text.length > MAX_IMPORT_BYTES) throw tooLarge();
  if (!text.trim())
    throw new HttpError(400, 'FileRequired', 'The file is empty. Start from the template.', [
      { field: 'file', message: 'Empty.' },
    ]);
  return text;
}

async function check(viewer: Viewer, text: string) {
  const parsed = parseInstalls(text);
  const existing = await existingKeys(
    viewer.companyId,
    parsed.rows.map((r) => r.value.tank.serial),
    parsed.rows.map((r) => r.value.home.reference),
  );
  const errors = [...parsed.errors];
  for (const r of parsed.rows) {
    if (existing.serials.has(r.value.tank.serial.toLowerCase()))
      errors.push({ row: r.line, field: 'serial', message: `serial ${r.value.tank.serial} is already registered.` });
    if (existing.references.has(r.value.home.reference))
      errors.push({
        row: r.line,
        field: 'home_reference',
        message: `home_reference ${r.value.home.reference} is already one of your homes.`,
      });
  }
  errors.sort((a, b) => a.row - b.row);
  const bad = new Set(errors.map((e) => e.row));
  return { parsed, errors, valid: parsed.rows.filter((r) => !bad.has(r.line)).length };
}

export async function previewInstalls(viewer: Viewer, text: string): Promise<ImportPreview> {
  const { parsed, errors, valid } = await check(viewer, text);
  return { total: parsed.total, valid, errors };
}

/** Imports every row, or none when any row has a problem (422 listing each). */
export async function commitInstalls(viewer: Viewer, text: string): Promise<{ imported: number }> {
  const { parsed, errors } = await check(viewer, text);
  if (errors.length) {
    throw new HttpError(
      422,
      'ImportHasErrors',
      `Nothing was imported: ${new Set(errors.map((e) => e.row)).size} of ${parsed.total} rows have problems. Fix them and import the whole file again.`,
      errors.map((e) => ({ field: `row ${e.row}: ${e.field}`, message: e.message })),
    );
  }
  try {
    const r = await importInstalls(
      viewer.companyId,
      parsed.rows.map((x) => x.value),
      viewer.userId,
    );
    return { imported: r.tanks };
  } catch (err) {
    // A serial or reference taken between the check and the insert: the transaction stored nothing.
    if ((err as { code?: string }).code === '23505' || (err as { cause?: { code?: string } }).cause?.code === '23505') {
      throw new HttpError(
        409,
        'ImportConflict',
        'Nothing was imported: a serial or home reference in the file was registered meanwhile. Preview the file again to see which.',
      );
    }
    throw err;
  }
}
