import { spawnSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';

describe('type check', () => {
  it('passes astro check (strict TypeScript over pages, islands, lib and tests)', () => {
    const r = spawnSync('npx', ['astro', 'check', '--minimumSeverity', 'error'], {
      cwd: new URL('../..', import.meta.url).pathname,
      encoding: 'utf8',
      timeout: 240_000,
    });
    expect(
      r.status,
      `${r.stdout}\n${r.stderr}`
        .split('\n')
        .filter((l) => /error/i.test(l))
        .slice(0, 40)
        .join('\n'),
    ).toBe(0);
  }, 300_000);
});
