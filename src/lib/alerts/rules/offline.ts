// Tank offline: no reading for longer than the configured time. Judged on the clock (a silent tank
// sends nothing to evaluate). Pure: no I/O.
import type { Thresholds } from '../thresholds';
import { MIN, clear, fmtTime, unknown, type Finding } from './common';

export function offlineFinding(lastTs: number | null, now: number, th: Thresholds): Finding {
  if (lastTs === null) return unknown; // never reported: not commissioned yet, not offline
  const silentMin = (now - lastTs) / MIN;
  if (silentMin <= th.offlineAfterMin) return clear;
  return {
    active: true,
    since: lastTs + th.offlineAfterMin * MIN,
    evidence: {
      summary: `No reading since ${fmtTime(lastTs)} (${Math.floor(silentMin)} min; the limit is ${th.offlineAfterMin} min).`,
      facts: {
        lastReadingAt: new Date(lastTs).toISOString(),
        silentMin: Math.floor(silentMin),
        offlineAfterMin: th.offlineAfterMin,
      },
      at: lastTs,
    },
  };
}
