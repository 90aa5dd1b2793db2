// The installed dependency tree suits the Node.js that runs it: every installed package's
// `engines.node` admits this Node (npm warns EBADENGINE otherwise: docs.npmjs.com, package.json
// "engines"), and `npm ls` finds nothing missing, invalid or extraneous.
import { spawnSync } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import semver from 'semver';
import { describe, expect, it } from 'vitest';

const root = new URL('../..', import.meta.url).pathname;
const lock = JSON.parse(readFileSync(join(root, 'package-lock.json'), 'utf8')) as {
  packages: Record<string, { optional?: boolean }>;
};

describe('dependencies on this Node.js', () => {
  it(`every installed package allows Node ${process.version}`, () => {
    const refused: string[] = [];
    let checked = 0;
    for (const path of Object.keys(lock.packages)) {
      const manifest = join(root, path, 'package.json');
      if (!existsSync(manifest)) continue; // an optional package for another platform, not installed
      const pkg = JSON.parse(readFileSync(manifest, 'utf8')) as {
        name?: string;
        version?: string;
        engines?: { node?: string };
      };
      checked++;
      const wanted = pkg.engines?.node;
      if (wanted && !semver.satisfies(process.version, wanted, { includePrerelease: true }))
        refused.push(`${pkg.name}@${pkg.version} wants node ${wanted}`);
    }
    expect(checked).toBeGreaterThan(100);
    expect(refused).toEqual([]);
  });

  it('npm ls finds the tree complete and consistent', () => {
    const r = spawnSync('npm', ['ls', '--all'], { cwd: root, encoding: 'utf8' });
    expect(r.stderr.trim()).toBe('');
    expect(r.status).toBe(0);
  }, 60_000);
});
