// Biome is the one linter and formatter, and its import rules hold the layers DEVELOPERS.md
// describes. The first test fails `npm test` on any lint or format error; the others prove the layer
// rules bite, by linting small probe files under the same configuration in a scratch folder.
import { spawnSync } from 'node:child_process';
import { cpSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';

const root = new URL('../../../', import.meta.url).pathname;
const biome = join(root, 'node_modules/.bin/biome');

function run(args: string[], cwd: string): { status: number | null; out: string } {
  const r = spawnSync(biome, [...args, '--colors=off'], { cwd, encoding: 'utf8' });
  return { status: r.status, out: `${r.stdout}${r.stderr}` };
}

describe('biome ci', () => {
  it('finds no lint or format error in the project', () => {
    const r = run(['ci', '.'], root);
    expect(r.status, r.out).toBe(0);
  });
});

describe('import boundaries', () => {
  const scratch = mkdtempSync(join(tmpdir(), 'heatlayer-lint-'));
  afterAll(() => rmSync(scratch, { recursive: true, force: true }));
  // The project's configuration without its schema link (the scratch folder has no node_modules).
  const config = readFileSync(join(root, 'biome.jsonc'), 'utf8').replace(/^\s*"\$schema":.*$/m, '');
  writeFileSync(join(scratch, 'biome.jsonc'), config);
  cpSync(join(root, 'tsconfig.json'), join(scratch, 'tsconfig.json'));

  function lint(file: string, source: string): string {
    mkdirSync(dirname(join(scratch, file)), { recursive: true });
    writeFileSync(join(scratch, file), source);
    const r = run(['lint', '--vcs-enabled=false', file], scratch);
    rmSync(join(scratch, file));
    return r.out;
  }

  it.each([
    ["import pg from 'pg';", 'pg'],
    ["import { readFileSync } from 'node:fs';", 'node:fs'],
    ["import { db } from '../../db';", 'the database module'],
    ["import { db } from '@/db';", 'the database module through the alias'],
    ["import { env } from '../server/env';", 'server code'],
  ])('src/lib/thermal may not import %s (%s)', (line) => {
    expect(
      lint(
        'src/lib/thermal/probe.ts',
        `${line}\nexport const probe = typeof ${line.includes('{') ? line.match(/\{ (\w+) \}/)![1] : 'pg'};\n`,
      ),
    ).toMatch(/src\/lib\/thermal is pure computation/);
  });

  it('src/lib/thermal may import its own pure modules', () => {
    expect(
      lint('src/lib/thermal/probe.ts', "import { tankFigures } from './figures';\nexport const probe = tankFigures;\n"),
    ).not.toMatch(/pure computation/);
  });

  it('src/db/queries may not import server modules or the alert rules', () => {
    expect(
      lint(
        'src/db/queries/probe.ts',
        "import { x } from '../../lib/alerts/evaluate.server';\nexport const probe = x;\n",
      ),
    ).toMatch(/holds SQL only/);
    expect(
      lint('src/db/queries/probe.ts', "import { x } from '@/lib/alerts/engine';\nexport const probe = x;\n"),
    ).toMatch(/holds SQL only/);
  });

  it("src imports zod only through '@/lib/zod' (configured for the Content-Security-Policy)", () => {
    expect(lint('src/lib/energy/probe.ts', "import { z } from 'zod';\nexport const probe = z;\n")).toMatch(
      /Import z from '@\/lib\/zod'/,
    );
    expect(lint('src/lib/energy/probe.ts', "import { z } from '@/lib/zod';\nexport const probe = z;\n")).not.toMatch(
      /Import z from/,
    );
  });

  it('the simulator may not import the database', () => {
    expect(lint('simulator/probe.ts', "import { db } from '../src/db';\nexport const probe = db;\n")).toMatch(
      /talks MQTT and HTTP only/,
    );
    expect(lint('simulator/probe.ts', "import { Pool } from 'pg';\nexport const probe = Pool;\n")).toMatch(
      /talks MQTT and HTTP only/,
    );
  });
});

// knip follows imports from the entry points in knip.json (scripts, pages, tests, benches) and
// fails on an export nothing imports, a file nothing reaches, or one thing exported twice.
describe('knip', () => {
  const knip = join(root, 'node_modules/.bin/knip');
  const runKnip = (cwd: string) => {
    const r = spawnSync(knip, ['--no-progress', '--no-config-hints'], { cwd, encoding: 'utf8' });
    return { status: r.status, out: `${r.stdout}${r.stderr}` };
  };

  it('finds no unused export or file in the project', () => {
    const r = runKnip(root);
    expect(r.status, r.out).toBe(0);
  });

  it('fails on an export nothing imports', () => {
    const scratch = mkdtempSync(join(tmpdir(), 'heatlayer-knip-'));
    try {
      writeFileSync(join(scratch, 'package.json'), '{ "name": "probe", "private": true, "type": "module" }');
      cpSync(join(root, 'knip.json'), join(scratch, 'knip.json'));
      mkdirSync(join(scratch, 'scripts'));
      mkdirSync(join(scratch, 'src/lib'), { recursive: true });
      writeFileSync(
        join(scratch, 'scripts/probe.ts'),
        "import { used } from '../src/lib/probe';\nconsole.log(used);\n",
      );
      writeFileSync(join(scratch, 'src/lib/probe.ts'), 'export const used = 1;\nexport const forgotten = 2;\n');
      const r = runKnip(scratch);
      expect(r.status).not.toBe(0);
      expect(r.out).toMatch(/forgotten/);
      expect(r.out).not.toMatch(/\bused\b/);
    } finally {
      rmSync(scratch, { recursive: true, force: true });
    }
  });
});
