// Files keep the names people gave them, whatever the script: the download header carries the
// name as RFC 6266 asks, with the UTF-8 form in filename* (RFC 5987).
import contentDisposition from 'content-disposition';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { baseUrl } from '../../support/browser';
import { closeTestDb } from '../../support/db';
import { jpegPhoto } from '../../support/commissioning';
import { draft, dropPlayground, playground, type Playground } from './fixtures';

let p: Playground;
beforeAll(async () => {
  p = await playground();
});
afterAll(async () => {
  await dropPlayground(p);
  await closeTestDb();
});

async function upload(name: string, bytes: Buffer, type: string, target: Record<string, string>) {
  const form = new FormData();
  form.set('file', new Blob([new Uint8Array(bytes)], { type }), name);
  for (const [k, v] of Object.entries(target)) form.set(k, v);
  const res = await fetch(`${baseUrl()}/api/uploads`, {
    method: 'POST',
    headers: { origin: baseUrl(), cookie: p.cookies.engineer },
    body: form,
  });
  expect(res.status).toBe(201);
  return (await res.json()).upload as { id: string; filename: string; url: string };
}

describe('downloads of files with any name', () => {
  for (const name of [
    'Zählerstand – 写真.jpg',
    'Ölkessel "alt" ; Keller.jpg',
    'émission\r\nX-Injected: yes.jpg',
    'plain-name.jpg',
  ]) {
    it(`serves ${JSON.stringify(name)} with its name in the header`, async () => {
      const stored = await upload(name, await jpegPhoto(64, 48), 'image/jpeg', {
        commissioningId: await draft(p.companyId),
      });
      const res = await fetch(`${baseUrl()}${stored.url}`, { headers: { cookie: p.cookies.engineer } });
      expect(res.status).toBe(200);
      expect(res.headers.get('content-type')).toBe('image/jpeg');
      expect(res.headers.get('x-injected')).toBeNull();
      const header = res.headers.get('content-disposition')!;
      expect(contentDisposition.parse(header)).toMatchObject({
        type: 'inline',
        parameters: { filename: stored.filename },
      });
      expect((await res.arrayBuffer()).byteLength).toBeGreaterThan(0);
    });
  }

  it('keeps the name as given (only path separators and control characters are replaced)', async () => {
    const stored = await upload('Zählerstand – 写真.jpg', await jpegPhoto(64, 48), 'image/jpeg', { tankId: p.tankId });
    expect(stored.filename).toBe('Zählerstand – 写真.jpg');
  });
});
