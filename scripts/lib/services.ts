// The product's long-running processes, in start order. Each later part of the product adds its
// process here once; `npm start` runs them all, `npm test` the ones its tests need.
import { join } from 'node:path';
import { buildDir } from './build';
import type { RunConfig } from './config';
import { createConnection } from 'node:net';
import { httpOk, waitFor, type ServiceSpec } from './processes';
import { demoTanks } from '../../src/lib/demo/scenario';
import { servicePassword } from '../../src/lib/telemetry/device-token';
import { brokerAcceptsService, ingestWorkerOnline, tankOnline } from '../../src/lib/telemetry/probes';

/** Answers when something accepts TCP connections on 127.0.0.1:port. */
function tcpOpen(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const socket = createConnection({ host: '127.0.0.1', port });
    socket.once('connect', () => {
      socket.end();
      resolve(true);
    });
    socket.once('error', () => resolve(false));
  });
}

/** The local fake mail server; not started when SMTP_URL points at a real provider. */
function mailService(c: RunConfig): ServiceSpec {
  return {
    name: 'mail',
    command: process.execPath,
    args: ['--import', 'tsx', 'scripts/mail-server.ts'],
    ready: () => waitFor('The fake mail server', () => tcpOpen(c.smtpPort)),
  };
}
const fakeMail = (c: RunConfig): ServiceSpec[] => (process.env.SMTP_URL ? [] : [mailService(c)]);

/** The local fake S3 server for photos and documents; not started when S3_ENDPOINT names a real one. */
function s3Service(c: RunConfig): ServiceSpec {
  return {
    name: 's3',
    command: process.execPath,
    args: ['--import', 'tsx', 'scripts/s3-server.ts'],
    ready: () => waitFor('The fake S3 server', () => tcpOpen(c.s3Port)),
  };
}
const fakeS3 = (c: RunConfig): ServiceSpec[] => (process.env.S3_ENDPOINT ? [] : [s3Service(c)]);

function webService(c: RunConfig): ServiceSpec {
  return {
    name: 'web',
    command: process.execPath,
    // Our server step settles the client's address before Astro reads it (scripts/web-server.ts).
    args: ['--import', 'tsx', 'scripts/web-server.ts', join(buildDir(), 'server/entry.mjs')],
    ready: () => waitFor('The web server', () => httpOk(`http://127.0.0.1:${c.webPort}/api/health`)),
  };
}

const tsxProcess = (name: string, script: string) => ({
  name,
  command: process.execPath,
  args: ['--import', 'tsx', script],
});
const mqttUrl = (c: RunConfig) => `mqtt://127.0.0.1:${c.mqttPort}`;

/** The MQTT broker (aedes), ready when it accepts the service account. */
function brokerService(c: RunConfig): ServiceSpec {
  return {
    ...tsxProcess('broker', 'scripts/broker.ts'),
    ready: () => waitFor('The MQTT broker', () => brokerAcceptsService(mqttUrl(c), servicePassword(process.env))),
  };
}

/** The ingest worker, ready when it has subscribed (its retained status topic says so) and its HTTP ingest answers. */
function ingestService(c: RunConfig): ServiceSpec {
  return {
    ...tsxProcess('ingest', 'scripts/ingest-worker.ts'),
    ready: async () => {
      await waitFor('The ingest worker', () => ingestWorkerOnline(mqttUrl(c), servicePassword(process.env)));
      await waitFor('The HTTP ingest', () => httpOk(`http://127.0.0.1:${c.ingestPort}/health`));
    },
  };
}

/** The demo fleet simulator, ready when its first tank is online (its backfill then runs on, with progress lines). */
function simulatorService(c: RunConfig): ServiceSpec[] {
  if (c.simulatorTanks <= 0) return [];
  const first = demoTanks()[0].serial;
  return [
    {
      ...tsxProcess('simulator', 'simulator/index.ts'),
      ready: () => waitFor('The fleet simulator', () => tankOnline(mqttUrl(c), servicePassword(process.env), first)),
    },
  ];
}

/** Every process `npm start` runs, in order. */
export function productServices(c: RunConfig): ServiceSpec[] {
  return [...fakeMail(c), ...fakeS3(c), brokerService(c), ingestService(c), webService(c), ...simulatorService(c)];
}

/** The processes the test suite needs running beside it. */
export function testServices(c: RunConfig): ServiceSpec[] {
  // TRUSTED_PROXIES=loopback: tests stand in for a proxy on this machine, acting as several client
  // addresses through X-Forwarded-For (sign-in throttle). ALERTS_CLOCK_MS=0: alert tests run the
  // alert clock on simulated time themselves.
  return [
    ...fakeMail(c),
    ...fakeS3(c),
    brokerService(c),
    { ...ingestService(c), env: { ALERTS_CLOCK_MS: '0' } },
    { ...webService(c), env: { TRUSTED_PROXIES: 'loopback' } },
  ];
}
