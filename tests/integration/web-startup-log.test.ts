// The web server, started with the environment `npm start` and `npm test` give it, logs no warnings
// on Node 20: not at start, not on the first page, not when the S3 client first stores and reads a
// photo (the AWS SDK checks the Node version then), not on its way down.
import { spawn, type ChildProcess } from 'node:child_process';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { buildDir } from '../../scripts/lib/build';
import { call, jpegPhoto } from '../support/commissioning';
import { closeTestDb } from '../support/db';
import { eventually } from '../support/eventually';
import { signInAs } from '../support/session';

// Own port in this run's block (DEVELOPERS.md: tests with their own servers take base+10 and up).
const port = Number(process.env.PG_PORT) + 50;
const url = `http://127.0.0.1:${port}`;
let web: ChildProcess | undefined;
afterAll(async () => {
  web?.kill('SIGKILL');
  await closeTestDb();
});

describe('web server log', () => {
  it('has no warnings from start to stop', async () => {
    let out = '';
    let err = '';
    web = spawn(process.execPath, ['--import', 'tsx', 'scripts/web-server.ts', join(buildDir(), 'server/entry.mjs')], {
      env: { ...process.env, PORT: String(port), AUTH_URL: url },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    web.stdout!.on('data', (d) => {
      out += d;
    });
    web.stderr!.on('data', (d) => {
      err += d;
    });
    await eventually(
      () =>
        fetch(`${url}/api/health`).then(
          (r) => r.ok,
          () => false,
        ),
      (ok) => ok,
      30_000,
      `the web server (log: ${out}${err})`,
    );

    const api = { base: url, cookie: await signInAs(url, 'engineer') };
    expect((await fetch(`${url}/commissioning`, { headers: { cookie: api.cookie } })).status).toBe(200);
    const draft = await call(api, 'POST', '/api/commissioning', {});
    expect(draft.status).toBe(201);
    const form = new FormData();
    form.set('file', new Blob([new Uint8Array(await jpegPhoto(64, 48))], { type: 'image/jpeg' }), 'plate.jpg');
    form.set('commissioningId', draft.body.id);
    const up = await fetch(`${url}/api/uploads`, {
      method: 'POST',
      headers: { origin: url, cookie: api.cookie },
      body: form,
    });
    expect(up.status).toBe(201);
    const { upload } = (await up.json()) as { upload: { id: string } };
    expect((await fetch(`${url}/api/uploads/${upload.id}`, { headers: { cookie: api.cookie } })).status).toBe(200);

    const exited = new Promise<number | null>((resolve) => web!.once('exit', resolve));
    web.kill('SIGTERM');
    expect(await exited).toBe(0);
    web = undefined;
    expect(out).toMatch(/Heatlayer web server on http:\/\/127\.0\.0\.1:/);
    expect(out.split('\n').filter((l) => /warn|deprecat/i.test(l))).toEqual([]);
    expect(err).toBe('');
  }, 60_000);
});
