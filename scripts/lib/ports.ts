// The block of ports a test run (and a benchmark beside it) binds: HEATLAYER_TEST_PORT_BASE and the
// TEST_PORT_BLOCK ports after it. The block must lie outside the kernel's ephemeral range, where
// every outgoing connection (to PostgreSQL, the broker, the web server) takes a local port at
// random: a listener there fails with EADDRINUSE whenever a client happened to take its port first.
// Linux's range: /proc/sys/net/ipv4/ip_local_port_range, 32768–60999 by default (kernel
// Documentation/networking/ip-sysctl.rst); IANA's dynamic range is 49152–65535 (RFC 6335 §6).
import { readFileSync } from 'node:fs';

/** Offsets 0–99 from the base: services 0–5, tests' own servers 10 and up, benchmarks 80 and up. */
export const TEST_PORT_BLOCK = 100;
/** Below both the Linux and the IANA ephemeral ranges. */
export const DEFAULT_TEST_PORT_BASE = 25400;

export type PortRange = readonly [low: number, high: number];

/** The ephemeral range this machine's kernel hands out, or null where it cannot be read (not Linux). */
export function ephemeralPortRange(file = '/proc/sys/net/ipv4/ip_local_port_range'): PortRange | null {
  try {
    const [low, high] = readFileSync(file, 'utf8').trim().split(/\s+/).map(Number);
    return Number.isInteger(low) && Number.isInteger(high) ? [low, high] : null;
  } catch {
    return null;
  }
}

/** Why a block starting at `base` cannot be used, or null when it can. */
export function portBlockProblem(base: number, range: PortRange | null): string | null {
  const last = base + TEST_PORT_BLOCK - 1;
  if (!Number.isInteger(base) || base < 1024 || last > 65535) {
    return `HEATLAYER_TEST_PORT_BASE=${base}: the test ports ${base}–${last} must lie between 1024 and 65535.`;
  }
  if (range && base <= range[1] && last >= range[0]) {
    return (
      `HEATLAYER_TEST_PORT_BASE=${base}: the test ports ${base}–${last} overlap the kernel's ephemeral range ` +
      `${range[0]}–${range[1]} (outgoing connections take ports there at random, so a test server would fail with ` +
      `EADDRINUSE now and then). Choose a base below ${range[0] - TEST_PORT_BLOCK + 1}, e.g. ${DEFAULT_TEST_PORT_BASE}.`
    );
  }
  return null;
}

/** This run's base: HEATLAYER_TEST_PORT_BASE or the default; throws when the block cannot be used. */
export function testPortBase(
  env: NodeJS.ProcessEnv = process.env,
  range: PortRange | null = ephemeralPortRange(),
): number {
  const raw = env.HEATLAYER_TEST_PORT_BASE;
  const base = raw === undefined || raw === '' ? DEFAULT_TEST_PORT_BASE : Number(raw);
  const problem = portBlockProblem(base, range);
  if (problem) throw new Error(problem);
  return base;
}
