// The client's address from real HTTP requests over loopback: the socket peer unless it is a
// trusted proxy; X-Forwarded-For walked from the right past trusted hops. The walk is the one
// RFC 7239 §5.2 and the de-facto X-Forwarded-For practice describe (each proxy appends the
// address it received from), as proxy-addr implements it.
import { createServer, type IncomingHttpHeaders, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  parseTrustedProxies,
  resolveClientAddress,
  settleForwardedHeaders,
  trustPredicate,
} from '../../../src/lib/server/client-address';

let server: Server;
let url = '';
let trust = trustPredicate([]);
let seen: { address: string; headers: IncomingHttpHeaders } | undefined;

beforeAll(async () => {
  server = createServer((req, res) => {
    const address = resolveClientAddress(req, trust);
    settleForwardedHeaders(req, trust);
    seen = { address, headers: req.headers };
    res.end();
  });
  // The OS picks a free loopback port: this test needs no fixed port.
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  url = `http://127.0.0.1:${(server.address() as AddressInfo).port}/`;
});
afterAll(() => new Promise<void>((resolve) => server.close(() => resolve())));

async function ask(trusted: string[], headers: Record<string, string>) {
  trust = trustPredicate(trusted);
  await fetch(url, { headers });
  return seen!;
}

describe('client address', () => {
  it('with no trusted proxy, takes the connection and ignores a forged X-Forwarded-For', async () => {
    const got = await ask([], {
      'x-forwarded-for': '203.0.113.7',
      'x-forwarded-proto': 'https',
      'x-forwarded-host': 'evil.example.net',
    });
    expect(got.address).toBe('127.0.0.1');
    // What Astro reads afterwards: the settled address, and no forwarded protocol or host.
    expect(got.headers['x-forwarded-for']).toBe('127.0.0.1');
    expect(got.headers['x-forwarded-proto']).toBeUndefined();
    expect(got.headers['x-forwarded-host']).toBeUndefined();
  });

  it('behind a trusted proxy, takes the address the proxy appended (the rightmost), not one the client wrote first', async () => {
    const got = await ask(['loopback'], {
      'x-forwarded-for': '198.51.100.1, 203.0.113.7',
      'x-forwarded-proto': 'https',
    });
    expect(got.address).toBe('203.0.113.7');
    expect(got.headers['x-forwarded-for']).toBe('203.0.113.7');
    expect(got.headers['x-forwarded-proto']).toBe('https');
  });

  it('skips every trusted hop, by address or CIDR range', async () => {
    const got = await ask(parseTrustedProxies('127.0.0.1, 10.0.0.0/8'), {
      'x-forwarded-for': '198.51.100.9, 203.0.113.7, 10.1.2.3',
    });
    expect(got.address).toBe('203.0.113.7');
  });

  it('takes the connection when the trusted proxy sent no X-Forwarded-For', async () => {
    expect((await ask(['loopback'], {})).address).toBe('127.0.0.1');
  });

  it('refuses a setting it cannot read, naming the entry', () => {
    expect(() => parseTrustedProxies('10.0.0.0/8, 10.0.0.0/33')).toThrow(/"10\.0\.0\.0\/33"/);
    expect(() => parseTrustedProxies('proxy.example.com')).toThrow(/proxy\.example\.com/);
    expect(parseTrustedProxies(' loopback , ::1 ,')).toEqual(['loopback', '::1']);
    expect(parseTrustedProxies('')).toEqual([]);
  });
});
