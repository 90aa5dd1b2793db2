// What may be uploaded, checked by content rather than by the name or type the browser claims:
// photos (JPEG, PNG, WebP), decoded, turned upright, stripped of metadata (a phone photo's
// location included) and made no larger than needed; PDF documents, checked to open.
import { PDFDocument } from 'pdf-lib';
import sharp from 'sharp';
import { HttpError } from '../server/authz';

/** Largest file accepted, bytes (a phone photo is a few MB; common practice for a form upload). */
export const MAX_UPLOAD_BYTES = 15 * 1024 * 1024;
/** Photos are kept at most this many pixels on their long side: plenty to read a data plate. */
export const MAX_IMAGE_EDGE_PX = 2048;

export type Detected = 'jpeg' | 'png' | 'webp' | 'pdf' | null;

/** The file's real type from its first bytes. */
export function sniff(bytes: Uint8Array): Detected {
  const b = Buffer.from(bytes.buffer, bytes.byteOffset, Math.min(bytes.byteLength, 16));
  if (b.length >= 3 && b[0] === 0xff && b[1] === 0xd8 && b[2] === 0xff) return 'jpeg';
  if (b.length >= 8 && b.subarray(0, 8).equals(Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])))
    return 'png';
  if (b.length >= 12 && b.toString('latin1', 0, 4) === 'RIFF' && b.toString('latin1', 8, 12) === 'WEBP') return 'webp';
  if (b.length >= 5 && b.toString('latin1', 0, 5) === '%PDF-') return 'pdf';
  return null;
}

export interface PreparedFile {
  kind: 'photo' | 'document';
  contentType: string;
  body: Buffer;
  width: number | null;
  height: number | null;
  downscaled: boolean;
  /** The name to keep (the photo's extension follows its new format). */
  filename: string;
}

const megabytes = (n: number) => `${(n / 1024 / 1024).toFixed(1)} MB`;

export function tooLarge(filename: string, bytes: number): HttpError {
  return new HttpError(
    413,
    'FileTooLarge',
    `“${filename}” is ${megabytes(bytes)}; files can be at most ${megabytes(MAX_UPLOAD_BYTES)}. Send a smaller photo, or split the document.`,
    [{ field: 'file', message: `At most ${megabytes(MAX_UPLOAD_BYTES)}.` }],
  );
}

/** Checks and prepares one uploaded file for storage; throws an HttpError naming the problem. */
export async function prepareUpload(filename: string, bytes: Buffer): Promise<PreparedFile> {
  const name = filename.replace(/[\\/\u0000-\u001f]/g, '_').slice(0, 200) || 'upload';
  if (bytes.length === 0)
    throw new HttpError(400, 'EmptyFile', `“${name}” is empty. Choose the photo or document again.`, [
      { field: 'file', message: 'The file is empty.' },
    ]);
  if (bytes.length > MAX_UPLOAD_BYTES) throw tooLarge(name, bytes.length);
  const type = sniff(bytes);
  if (!type) {
    throw new HttpError(
      415,
      'UnsupportedFileType',
      `“${name}” is not a photo (JPEG, PNG or WebP) or a PDF document, so it was not kept. Export it as one of those and upload it again.`,
      [{ field: 'file', message: 'Only JPEG, PNG, WebP or PDF.' }],
    );
  }
  if (type === 'pdf') {
    try {
      // pdf-lib reads leniently: a file it can load but finds no page in is damaged too.
      const doc = await PDFDocument.load(bytes, {
        ignoreEncryption: true,
        updateMetadata: false,
        throwOnInvalidObject: true,
      });
      if (doc.getPageCount() === 0) throw new Error('no pages');
    } catch {
      throw new HttpError(
        422,
        'CorruptDocument',
        `“${name}” starts like a PDF but cannot be opened (it may be damaged or incomplete). Save it again and upload the new copy.`,
        [{ field: 'file', message: 'The PDF cannot be opened.' }],
      );
    }
    return {
      kind: 'document',
      contentType: 'application/pdf',
      body: bytes,
      width: null,
      height: null,
      downscaled: false,
      filename: name,
    };
  }
  try {
    const source = sharp(bytes, { failOn: 'warning' });
    const meta = await source.metadata();
    const { data, info } = await source
      .rotate()
      .resize({ width: MAX_IMAGE_EDGE_PX, height: MAX_IMAGE_EDGE_PX, fit: 'inside', withoutEnlargement: true })
      .jpeg({ quality: 82, mozjpeg: true })
      .toBuffer({ resolveWithObject: true });
    const longEdge = Math.max(meta.width ?? 0, meta.height ?? 0);
    return {
      kind: 'photo',
      contentType: 'image/jpeg',
      body: data,
      width: info.width,
      height: info.height,
      downscaled: longEdge > MAX_IMAGE_EDGE_PX,
      filename: `${name.replace(/\.(jpe?g|png|webp)$/i, '')}.jpg`,
    };
  } catch {
    throw new HttpError(
      422,
      'CorruptImage',
      `“${name}” looks like a ${type.toUpperCase()} photo but cannot be read (it may be damaged or only partly sent). Take or export the photo again and upload the new copy.`,
      [{ field: 'file', message: 'The image cannot be read.' }],
    );
  }
}
