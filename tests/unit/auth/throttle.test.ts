// The back-off schedule of failed sign-ins for one account from one address: free tries, then
// a delay doubling per failure up to a cap (exponential back-off, OWASP Authentication Cheat
// Sheet "Protect against automated attacks"; the numbers are common practice).
import { describe, expect, it } from 'vitest';
import { backOffMs, backOffVerdict, throttlePolicy } from '../../../src/lib/auth/throttle';

const MIN = 60_000;

describe('sign-in back-off per account and address', () => {
  it('is free for the first tries, then 1, 2, 4 … minutes, at most an hour', () => {
    const { freeFailures } = throttlePolicy.accountAddress;
    expect([0, 1, freeFailures - 1].map(backOffMs)).toEqual([0, 0, 0]);
    expect([5, 6, 7, 8, 9, 10, 11, 30].map((f) => backOffMs(f) / MIN)).toEqual([1, 2, 4, 8, 16, 32, 60, 60]);
  });

  it('blocks until the last failure plus the delay, and says how long in whole seconds', () => {
    const last = new Date('2026-01-10T09:00:00Z');
    const t = last.getTime();
    expect(backOffVerdict(4, last, t + 1000)).toEqual({ blocked: false });
    expect(backOffVerdict(5, last, t + 1000)).toEqual({ blocked: true, retryAfterS: 59 });
    expect(backOffVerdict(6, last, t + 61_000)).toEqual({ blocked: true, retryAfterS: 59 });
    expect(backOffVerdict(6, last, t + 2 * MIN)).toEqual({ blocked: false });
    expect(backOffVerdict(5, last, t + MIN - 1)).toEqual({ blocked: true, retryAfterS: 1 });
  });
});
