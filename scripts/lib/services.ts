// The product's long-running processes, in start order. Each later part of the product adds its
// process here once; `npm start` runs them all, `npm test` the ones its tests need.
import type { RunConfig } from './config';
import { httpOk, waitFor, type ServiceSpec } from './processes';

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
  return [webService(c)];
}

/** The processes the test suite needs running beside it. */
export function testServices(c: RunConfig): ServiceSpec[] {
  return [webService(c)];
}
