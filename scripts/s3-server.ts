// The local fake S3 server (s3rver) for development and tests: photos, documents and
// commissioning records are stored through the S3 API exactly as against a real bucket.
// Objects live under <data dir>/s3; only loopback is served.
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import S3rver from 's3rver';
import { env } from '../src/lib/server/env';

const e = env();
const directory = join(e.HEATLAYER_DATA_DIR, 's3');
mkdirSync(directory, { recursive: true });

const server = new S3rver({
  address: '127.0.0.1',
  port: e.S3_PORT,
  directory,
  silent: true,
  configureBuckets: [{ name: e.S3_BUCKET, configs: [] }],
});

await server.run();
console.log(`fake S3 on http://127.0.0.1:${e.S3_PORT}, bucket ${e.S3_BUCKET}, objects in ${directory}`);

const stop = () => {
  server.close().finally(() => process.exit(0));
};
process.on('SIGTERM', stop);
process.on('SIGINT', stop);
