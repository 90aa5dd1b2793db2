// The web process (`npm start` and the tests start it): the built Astro app's standalone handler
// (pages, API and static files), behind one step of our own that settles who the client is from
// the TCP connection and TRUSTED_PROXIES (Astro alone would believe any X-Forwarded-For) and sets
// the security headers of every answer, static files included (src/lib/server/security-headers.ts).
// Usage: tsx scripts/web-server.ts [path/to/dist/server/entry.mjs]
import { createServer } from 'node:http';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { settleForwardedHeaders, trustPredicate } from '../src/lib/server/client-address';
import { env } from '../src/lib/server/env';
import { setSecurityHeaders } from '../src/lib/server/security-headers';
import { buildDir } from './lib/build';

type NodeHandler = (req: import('node:http').IncomingMessage, res: import('node:http').ServerResponse) => void;

async function main(): Promise<void> {
  const e = env();
  const trust = trustPredicate(e.TRUSTED_PROXIES);
  // The adapter starts its own server on import unless told not to; we serve its handler instead.
  process.env.ASTRO_NODE_AUTOSTART = 'disabled';
  const entry = process.argv[2] ?? join(buildDir(), 'server/entry.mjs');
  const { handler } = (await import(pathToFileURL(entry).href)) as { handler: NodeHandler };
  const server = createServer((req, res) => {
    settleForwardedHeaders(req, trust);
    setSecurityHeaders(res);
    handler(req, res);
  });
  server.listen(e.PORT, e.HOST, () => {
    const proxies = e.TRUSTED_PROXIES.length
      ? `trusting forwarded headers from ${e.TRUSTED_PROXIES.join(', ')}`
      : 'no trusted proxies';
    console.log(`Heatlayer web server on http://${e.HOST}:${e.PORT} (${proxies})`);
  });
  const stop = () => {
    server.close(() => process.exit(0));
    server.closeIdleConnections();
    setTimeout(() => process.exit(0), 2000).unref();
  };
  process.once('SIGTERM', stop);
  process.once('SIGINT', stop);
}

main().catch((err) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
