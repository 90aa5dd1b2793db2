import type { IncomingMessage } from 'node:http';
import proxyAddr from 'proxy-addr';

/**
 * Who the client is, decided once per request from the TCP connection, before Astro sees it.
 *
 * Astro's Node adapter takes the first X-Forwarded-For value as `clientAddress`, whoever sent
 * the header, so on its own anyone could claim any address. The web process
 * (scripts/web-server.ts) therefore rewrites the forwarded headers first: the socket's peer is
 * the client unless it is a trusted proxy; X-Forwarded-For is then walked from the right,
 * skipping trusted hops, and the first untrusted address is the client (proxy-addr does the
 * walk, as Express's "trust proxy" does). Astro then reads the one address left in the header.
 */
export type TrustPredicate = (address: string, hop: number) => boolean;

/** Forwarded headers that only a trusted proxy may set. */
const forwardedHeaders = ['x-forwarded-proto', 'x-forwarded-host', 'x-forwarded-port', 'forwarded'] as const;

/**
 * The trusted proxies from TRUSTED_PROXIES: comma-separated IP addresses and CIDR ranges, or
 * the names `loopback`, `linklocal`, `uniquelocal`. Empty: nobody is trusted. Throws naming the
 * entry it cannot read.
 */
export function parseTrustedProxies(setting: string | undefined): string[] {
  const entries = (setting ?? '')
    .split(',')
    .map((s) => s.trim())
    .filter(Boolean);
  for (const entry of entries) {
    try {
      proxyAddr.compile(entry);
    } catch {
      throw new Error(
        `"${entry}" is not an IP address, a CIDR range (e.g. 10.0.0.0/8) or one of loopback, linklocal, uniquelocal.`,
      );
    }
  }
  return entries;
}

export function trustPredicate(entries: readonly string[]): TrustPredicate {
  return entries.length ? proxyAddr.compile([...entries]) : () => false;
}

/** The client's address: the socket peer, or (through trusted proxies only) the nearest untrusted forwarded hop. */
export function resolveClientAddress(req: IncomingMessage, trust: TrustPredicate): string {
  if (!req.socket?.remoteAddress) return 'unknown';
  return proxyAddr(req, trust);
}

/**
 * Leaves exactly one address in X-Forwarded-For (the resolved client) and drops the other
 * forwarded headers unless the peer is a trusted proxy, so nothing downstream can be fooled.
 */
export function settleForwardedHeaders(req: IncomingMessage, trust: TrustPredicate): void {
  const peer = req.socket?.remoteAddress;
  const peerTrusted = !!peer && trust(peer, 0);
  req.headers['x-forwarded-for'] = resolveClientAddress(req, trust);
  if (!peerTrusted) for (const name of forwardedHeaders) delete req.headers[name];
}
