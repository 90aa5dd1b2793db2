import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { PDFDocument } from 'pdf-lib';
import { HttpError } from '../../../src/lib/server/authz';
import { MAX_IMAGE_EDGE_PX, MAX_UPLOAD_BYTES, prepareUpload, sniff } from '../../../src/lib/storage/files.server';
import { jpegPhoto, pngImage, truncatedJpeg } from '../../support/commissioning';

async function refusal(p: Promise<unknown>): Promise<HttpError> {
  try {
    await p;
  } catch (err) {
    if (err instanceof HttpError) return err;
    throw err;
  }
  throw new Error('The upload was accepted.');
}

describe('upload checks', () => {
  it('knows files by their content, not their names', async () => {
    expect(sniff(await jpegPhoto(20, 20))).toBe('jpeg');
    expect(sniff(await pngImage(20, 20))).toBe('png');
    expect(sniff(Buffer.from('%PDF-1.7\n'))).toBe('pdf');
    expect(sniff(Buffer.from('MZ\x90\x00'))).toBeNull();
  });

  it('refuses a file of the wrong type, naming it', async () => {
    const e = await refusal(prepareUpload('notes.jpg', Buffer.from('just some text, not a photo')));
    expect([e.status, e.code]).toEqual([415, 'UnsupportedFileType']);
    expect(e.message).toMatch(/“notes.jpg” is not a photo \(JPEG, PNG or WebP\) or a PDF document/);
  });

  it('refuses a file over the size limit', async () => {
    const e = await refusal(prepareUpload('huge.jpg', Buffer.alloc(MAX_UPLOAD_BYTES + 1, 0xff)));
    expect([e.status, e.code]).toEqual([413, 'FileTooLarge']);
    expect(e.message).toMatch(/files can be at most 15.0 MB/);
  });

  it('refuses a damaged photo and a damaged PDF', async () => {
    const img = await refusal(prepareUpload('plate.jpg', await truncatedJpeg()));
    expect([img.status, img.code]).toEqual([422, 'CorruptImage']);
    const pdf = await refusal(prepareUpload('manual.pdf', Buffer.from('%PDF-1.7\nthis is not really a pdf')));
    expect([pdf.status, pdf.code]).toEqual([422, 'CorruptDocument']);
  });

  it('downscales a large photo to the edge limit and stores it as JPEG', async () => {
    const p = await prepareUpload('cylinder.png', await pngImage(3000, 2000));
    expect(p).toMatchObject({
      kind: 'photo',
      contentType: 'image/jpeg',
      width: MAX_IMAGE_EDGE_PX,
      height: Math.round((2000 * MAX_IMAGE_EDGE_PX) / 3000),
      downscaled: true,
      filename: 'cylinder.jpg',
    });
    const meta = await sharp(p.body).metadata();
    expect([meta.format, meta.width]).toEqual(['jpeg', MAX_IMAGE_EDGE_PX]);
  });

  it('keeps a small photo’s size and a valid PDF as sent', async () => {
    expect(await prepareUpload('small.jpg', await jpegPhoto(640, 480))).toMatchObject({
      width: 640,
      height: 480,
      downscaled: false,
    });
    const doc = await PDFDocument.create();
    doc.addPage();
    const bytes = Buffer.from(await doc.save());
    const p = await prepareUpload('sheet.pdf', bytes);
    expect(p).toMatchObject({ kind: 'document', contentType: 'application/pdf' });
    expect(p.body.equals(bytes)).toBe(true);
  });
});
