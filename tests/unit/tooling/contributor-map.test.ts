// The map of the code in DEVELOPERS.md is the newcomer's first read: every path it names must
// exist, and every folder and module directly under src/ and src/lib/ must be on it (a folder is on
// it when it, or a path inside it, is named).
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

const root = new URL('../../../', import.meta.url).pathname;
const guide = readFileSync(join(root, 'DEVELOPERS.md'), 'utf8');
const block = guide.split('## Map of the code')[1]!.split('```')[1]!;

/** The paths the map names: a top-level line starts a folder, a line indented by two names a path in it. */
function mapped(): string[] {
  const out: string[] = [];
  let top = '';
  for (const line of block.split('\n')) {
    const top1 = line.match(/^(\S+)(\s|$)/);
    const inner = line.match(/^ {2}(\S+)(\s|$)/);
    if (top1) {
      top = top1[1]!;
      out.push(top);
    } else if (inner) out.push(`${top}${inner[1]}`);
  }
  return out.map((p) => p.replace(/\/$/, ''));
}

const listed = (dir: string) =>
  readdirSync(join(root, dir), { withFileTypes: true })
    .filter((e) => e.isDirectory() || /\.(ts|tsx)$/.test(e.name))
    .filter((e) => !e.name.endsWith('.d.ts'))
    .map((e) => `${dir}/${e.name}`);

describe('the map of the code', () => {
  const paths = mapped();

  it('names only paths that exist', () => {
    expect(paths.length).toBeGreaterThan(20);
    expect(paths.filter((p) => !existsSync(join(root, p)))).toEqual([]);
  });

  it('has every folder and module directly under src/ and src/lib/', () => {
    const wanted = [...listed('src'), ...listed('src/lib')].filter((p) => p !== 'src/lib' && p !== 'src/env.d.ts');
    expect(wanted.filter((w) => !paths.some((p) => p === w || p.startsWith(`${w}/`)))).toEqual([]);
  });
});
