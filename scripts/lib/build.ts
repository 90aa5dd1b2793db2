// Builds the Astro app when its inputs changed since the last build (a content hash, not mtimes,
// so a fresh clone and a re-run agree).
import { spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, readdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';

const root = new URL('../..', import.meta.url).pathname;
const inputs = ['src', 'public', 'astro.config.mjs', 'tailwind.config.mjs', 'tsconfig.json', 'package-lock.json'];

function hashTree(path: string, h: ReturnType<typeof createHash>): void {
  if (!existsSync(path)) return;
  if (statSync(path).isDirectory()) {
    for (const name of readdirSync(path).sort()) hashTree(join(path, name), h);
  } else {
    h.update(path.slice(root.length)).update(readFileSync(path));
  }
}

/** Where the build lives: dist/, or a folder of its own for a test run on another port block. */
export function buildDir(): string {
  return process.env.HEATLAYER_BUILD_DIR || join(root, 'dist');
}

export function ensureBuild(): void {
  const h = createHash('sha256');
  for (const i of inputs) hashTree(join(root, i), h);
  const digest = h.digest('hex');
  const marker = join(buildDir(), '.heatlayer-build-hash');
  if (existsSync(marker) && readFileSync(marker, 'utf8') === digest && existsSync(join(buildDir(), 'server/entry.mjs')))
    return;
  console.log('[build] building the web app…');
  const r = spawnSync('npx', ['astro', 'build'], { cwd: root, stdio: 'inherit' });
  if (r.status !== 0) throw new Error('astro build failed; see the output above.');
  writeFileSync(marker, digest);
}
