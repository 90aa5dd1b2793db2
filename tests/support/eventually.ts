// Waiting for what the system reaches on its own time (a worker's batch, a cached summary's refresh).

/** Polls `probe` until it returns a value that `done` accepts (or throws after `timeoutMs`). */
export async function eventually<T>(
  probe: () => Promise<T>,
  done: (v: T) => boolean,
  timeoutMs = 15_000,
  what = 'the expected state',
): Promise<T> {
  const until = Date.now() + timeoutMs;
  let last: T | undefined;
  while (Date.now() < until) {
    last = await probe();
    if (done(last)) return last;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`Timed out waiting for ${what}; last value: ${JSON.stringify(last)}`);
}
