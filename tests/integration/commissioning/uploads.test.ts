import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { getObject } from '../../../src/lib/storage/objects.server';
import { baseUrl } from '../../support/browser';
import { closeTestDb, query } from '../../support/db';
import { signInAs } from '../../support/session';
import { call, jpegPhoto, pngImage, truncatedJpeg, type Api } from '../../support/commissioning';

let kestrel: Api;
let orrin: Api;
let householder: Api;
let draftId: string;

beforeAll(async () => {
  kestrel = { base: baseUrl(), cookie: await signInAs(baseUrl(), 'engineer', 'kestrel-vale') };
  orrin = { base: baseUrl(), cookie: await signInAs(baseUrl(), 'engineer', 'orrin-bay') };
  householder = { base: baseUrl(), cookie: await signInAs(baseUrl(), 'householder', 'kestrel-vale') };
  draftId = (await call(kestrel, 'POST', '/api/commissioning', {})).body.id;
});
afterAll(closeTestDb);

async function upload(api: Api, name: string, bytes: Buffer, type: string) {
  const form = new FormData();
  form.set('file', new Blob([new Uint8Array(bytes)], { type }), name);
  form.set('commissioningId', draftId);
  const res = await fetch(`${api.base}/api/uploads`, {
    method: 'POST',
    headers: { origin: api.base, cookie: api.cookie },
    body: form,
  });
  return { status: res.status, body: await res.json() };
}

describe('uploads', () => {
  it('refuses a file of the wrong type with a message naming it', async () => {
    const r = await upload(kestrel, 'wiring.jpg', Buffer.from('#!/bin/sh\necho not a photo\n'), 'image/jpeg');
    expect(r.status).toBe(415);
    expect(r.body.error).toMatchObject({
      code: 'UnsupportedFileType',
      fields: [{ field: 'file', message: 'Only JPEG, PNG, WebP or PDF.' }],
    });
    expect(r.body.error.message).toMatch(/“wiring.jpg” is not a photo/);
  });

  it('refuses a file that is too large', async () => {
    const r = await upload(
      kestrel,
      'huge.jpg',
      Buffer.concat([await jpegPhoto(64, 64), Buffer.alloc(16 * 1024 * 1024)]),
      'image/jpeg',
    );
    expect(r.status).toBe(413);
    expect(r.body.error.code).toBe('FileTooLarge');
    expect(r.body.error.message).toMatch(/at most 15.0 MB/);
  });

  it('refuses a damaged photo', async () => {
    const r = await upload(kestrel, 'plate.jpg', await truncatedJpeg(), 'image/jpeg');
    expect(r.status).toBe(422);
    expect(r.body.error.code).toBe('CorruptImage');
    expect(r.body.error.message).toMatch(/“plate.jpg” looks like a JPEG photo but cannot be read/);
  });

  it('stores nothing for a refused file', async () => {
    const rows = await query('select id from uploads where commissioning_id = $1', [draftId]);
    expect(rows).toEqual([]);
  });

  it('stores a photo downscaled through S3, viewable by its company only', async () => {
    const r = await upload(kestrel, 'cylinder.png', await pngImage(3000, 2000), 'image/png');
    expect(r.status).toBe(201);
    expect(r.body.upload).toMatchObject({
      kind: 'photo',
      filename: 'cylinder.jpg',
      width: 2048,
      height: 1365,
      downscaled: true,
    });
    const [row] = await query<{ storage_key: string; company_id: string }>(
      'select storage_key, company_id from uploads where id = $1',
      [r.body.upload.id],
    );
    expect(row.storage_key.startsWith(`${row.company_id}/uploads/`)).toBe(true);
    // The object itself is in the S3 bucket (the fake S3 server), already downscaled.
    const stored = await getObject(row.storage_key);
    expect((await sharp(stored!).metadata()).width).toBe(2048);

    const own = await fetch(`${baseUrl()}${r.body.upload.url}`, { headers: { cookie: kestrel.cookie } });
    expect(own.status).toBe(200);
    expect(own.headers.get('content-type')).toBe('image/jpeg');
    const bytes = Buffer.from(await own.arrayBuffer());
    expect(bytes.subarray(0, 3)).toEqual(Buffer.from([0xff, 0xd8, 0xff]));

    const other = await fetch(`${baseUrl()}${r.body.upload.url}`, { headers: { cookie: orrin.cookie } });
    expect(other.status).toBe(404);
    // A householder of another home of the same company does not see it either.
    const hh = await fetch(`${baseUrl()}${r.body.upload.url}`, { headers: { cookie: householder.cookie } });
    expect(hh.status).toBe(404);
    const anonymous = await fetch(`${baseUrl()}${r.body.upload.url}`);
    expect(anonymous.status).toBe(401);
  });

  it('refuses an upload to another company’s draft', async () => {
    const form = new FormData();
    form.set('file', new Blob([new Uint8Array(await jpegPhoto(32, 32))], { type: 'image/jpeg' }), 'x.jpg');
    form.set('commissioningId', draftId);
    const res = await fetch(`${baseUrl()}/api/uploads`, {
      method: 'POST',
      headers: { origin: baseUrl(), cookie: orrin.cookie },
      body: form,
    });
    expect(res.status).toBe(404);
  });
});
