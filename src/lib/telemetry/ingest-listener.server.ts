// The ingest tier's HTTP listener: `POST /api/ingest` from gateways (and forwarded by the web), on
// its own port in the ingest worker's process, so a backfill flood competes with the MQTT worker
// for this process's time, not with the pages. `GET /health` answers while it listens.
import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http';
import { Readable } from 'node:stream';
import { problem } from '../server/http';
import { setSecurityHeaders } from '../server/security-headers';
import { answerIngest } from './http-ingest.server';

/** The Fetch API request of a Node one, its body streamed (read bounded by `readLimitedBody`). */
function toRequest(req: IncomingMessage, origin: string): Request {
  const headers = new Headers();
  for (const [k, v] of Object.entries(req.headers)) if (typeof v === 'string') headers.set(k, v);
  const hasBody = req.method !== 'GET' && req.method !== 'HEAD';
  return new Request(new URL(req.url ?? '/', origin), {
    method: req.method,
    headers,
    ...(hasBody ? { body: Readable.toWeb(req) as ReadableStream, duplex: 'half' } : {}),
  } as RequestInit);
}

async function send(res: ServerResponse, answer: Response): Promise<void> {
  const body = Buffer.from(await answer.arrayBuffer());
  // The headers every answer of ours carries (a policy that lets nothing run, nosniff), as the web's.
  setSecurityHeaders(res);
  res.writeHead(answer.status, { ...Object.fromEntries(answer.headers), 'content-length': String(body.length) });
  res.end(body);
}

async function route(req: IncomingMessage, origin: string): Promise<Response> {
  const path = (req.url ?? '/').split('?')[0];
  if (path === '/health' && req.method === 'GET')
    return new Response('ok', { headers: { 'content-type': 'text/plain' } });
  if (path !== '/api/ingest') return problem(404, 'NotFound', 'This port takes readings at POST /api/ingest only.');
  if (req.method !== 'POST') return problem(405, 'MethodNotAllowed', 'Send readings with POST.');
  return answerIngest(toRequest(req, origin));
}

/** Listens on host:port; resolves once listening. */
export function listenForIngest(host: string, port: number): Promise<Server> {
  const origin = `http://${host}:${port}`;
  const server = createServer((req, res) => {
    route(req, origin)
      .then((answer) => send(res, answer))
      .catch((err) => {
        console.error('[ingest] HTTP answer failed:', err instanceof Error ? err.message : err);
        if (!res.headersSent) res.writeHead(500);
        res.end();
      });
  });
  // Slow or idle clients must not hold sockets for ever (a gateway sends one batch and waits).
  server.requestTimeout = 60_000;
  server.headersTimeout = 20_000;
  return new Promise((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, host, () => resolve(server));
  });
}
