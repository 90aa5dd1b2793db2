// The product's long-running processes, in start order. Each later part of the product adds its
// process here once; `npm start` runs them all, `npm test` the ones its tests need.
import type { RunConfig } from './config';
import { createConnection } from 'node:net';
import { httpOk, waitFor, type ServiceSpec } from './processes';

/** Answers when something accepts TCP connections on 127.0.0.1:port. */
function tcpOpen(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const socket = createConnection({ host: '127.0.0.1', port });
    socket.once('connect', () => { socket.end(); resolve(true); });
    socket.once('error', () => resolve(false));
  });
}

/** The local fake mail server; not started when SMTP_URL points at a real provider. */
export function mailService(c: RunConfig): ServiceSpec {
  return {
    name: 'mail',
    command: process.execPath,
    args: ['--import', 'tsx', 'scripts/mail-server.ts'],
    ready: () => waitFor('The fake mail server', () => tcpOpen(c.smtpPort)),
  };
}
const fakeMail = (c: RunConfig): ServiceSpec[] => (process.env.SMTP_URL ? [] : [mailService(c)]);

export function webService(c: RunConfig): ServiceSpec {
  return {
    name: 'web',
    command: process.execPath,
    args: ['dist/server/entry.mjs'],
    ready: () => waitFor('The web server', () => httpOk(`http://127.0.0.1:${c.webPort}/api/health`)),
  };
}

/** Every process `npm start` runs, in order. */
export function productServices(c: RunConfig): ServiceSpec[] {
  return [...fakeMail(c), webService(c)];
}

/** The processes the test suite needs running beside it. */
export function testServices(c: RunConfig): ServiceSpec[] {
  // TRUST_PROXY: tests act as several client addresses through X-Forwarded-For (sign-in throttle).
  return [...fakeMail(c), { ...webService(c), env: { TRUST_PROXY: '1' } }];
}
