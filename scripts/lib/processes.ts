// Starts the product's long-running processes as children, prefixes their output, and stops them
// all together (Ctrl-C, a failure, or the end of the tests).
import { spawn, type ChildProcess } from 'node:child_process';

export interface ServiceSpec {
  name: string;
  command: string;
  args: string[];
  env?: Record<string, string>;
  /** Resolves when the service is ready (e.g. its port answers). */
  ready?: () => Promise<void>;
}

const children: { name: string; proc: ChildProcess }[] = [];
let stopping = false;

function prefixLines(name: string, chunk: Buffer, out: NodeJS.WriteStream): void {
  for (const line of chunk.toString().split('\n')) if (line.trim()) out.write(`[${name}] ${line}\n`);
}

export async function startService(
  spec: ServiceSpec,
  onExit?: (name: string, code: number | null) => void,
): Promise<ChildProcess> {
  const proc = spawn(spec.command, spec.args, {
    env: { ...process.env, ...spec.env },
    stdio: ['ignore', 'pipe', 'pipe'],
    cwd: new URL('../..', import.meta.url).pathname,
  });
  proc.stdout?.on('data', (c: Buffer) => prefixLines(spec.name, c, process.stdout));
  proc.stderr?.on('data', (c: Buffer) => prefixLines(spec.name, c, process.stderr));
  proc.on('exit', (code) => {
    if (!stopping) onExit?.(spec.name, code);
  });
  children.push({ name: spec.name, proc });
  if (spec.ready) await spec.ready();
  return proc;
}

/** Stops every child: SIGTERM, then SIGKILL after a grace period. */
export async function stopServices(graceMs = 5000): Promise<void> {
  stopping = true;
  await Promise.all(
    children.reverse().map(
      ({ proc }) =>
        new Promise<void>((resolve) => {
          if (proc.exitCode !== null || proc.signalCode !== null) return resolve();
          const timer = setTimeout(() => proc.kill('SIGKILL'), graceMs);
          proc.once('exit', () => {
            clearTimeout(timer);
            resolve();
          });
          proc.kill('SIGTERM');
        }),
    ),
  );
  children.length = 0;
}

/** Polls until `probe` succeeds or the time runs out. */
export async function waitFor(what: string, probe: () => Promise<boolean>, timeoutMs = 60_000): Promise<void> {
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    try {
      if (await probe()) return;
    } catch {
      /* not up yet */
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`${what} did not become ready within ${timeoutMs / 1000} s.`);
}

export async function httpOk(url: string): Promise<boolean> {
  const res = await fetch(url);
  return res.ok;
}
