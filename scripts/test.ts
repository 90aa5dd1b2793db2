// `npm test`: the same bootstrap as `npm start` on a block of ports of its own and a throwaway
// database, then every test (unit, integration, browser) in Vitest. Extra arguments go to Vitest,
// e.g. `npm test -- tests/unit/thermal`. Ends with the line `N passed, N failed`.
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { processEnv, testConfig } from './lib/config';
import { DEFAULT_TEST_PORT_BASE } from './lib/ports';
import { prepare } from './lib/prepare';
import { storeDemoDocuments } from './seed';
import { startService, stopServices } from './lib/processes';
import { stopPostgres } from './lib/postgres';
import { testServices } from './lib/services';

const root = new URL('..', import.meta.url).pathname;

interface VitestJson {
  numPassedTests: number;
  numFailedTests: number;
  numPendingTests: number;
  numTodoTests: number;
  success: boolean;
}

async function main(): Promise<number> {
  const c = testConfig();
  // A run on another port block (beside the default one) builds into a folder of its own, so that
  // one run rebuilding never pulls the files from under another run's web server.
  if (c.pgPort !== DEFAULT_TEST_PORT_BASE && !process.env.HEATLAYER_BUILD_DIR)
    process.env.HEATLAYER_BUILD_DIR = join(root, '.data', `build-${c.pgPort}`);
  rmSync(c.dataDir, { recursive: true, force: true });
  mkdirSync(c.dataDir, { recursive: true });
  const pgServer = await prepare(c, { throwaway: true });
  const env = processEnv(c, pgServer.url, 'test');
  Object.assign(process.env, env);
  try {
    for (const spec of testServices(c)) await startService(spec);
    // The demo's commissioning documents, once object storage is up (scripts/seed.ts).
    await storeDemoDocuments();
    const report = join(c.dataDir, 'vitest.json');
    const args = [
      'vitest',
      'run',
      '--reporter=default',
      '--reporter=json',
      `--outputFile.json=${report}`,
      ...process.argv.slice(2),
    ];
    const r = spawnSync('npx', args, {
      cwd: root,
      stdio: 'inherit',
      env: {
        ...process.env,
        ...env,
        TEST_BASE_URL: `http://localhost:${c.webPort}`,
        HEATLAYER_TEST: '1',
        HEATLAYER_TEST_PORT_BASE: String(c.pgPort),
      },
    });
    if (!existsSync(report)) {
      console.error('Vitest wrote no results.');
      console.log('0 passed, 1 failed');
      return 1;
    }
    const res = JSON.parse(readFileSync(report, 'utf8')) as VitestJson;
    const skipped = res.numPendingTests + res.numTodoTests;
    // The closing line CI reads to know that tests ran.
    console.log(`${res.numPassedTests} passed, ${res.numFailedTests} failed${skipped ? `, ${skipped} skipped` : ''}`);
    return r.status === 0 && res.success ? 0 : 1;
  } finally {
    await stopServices();
    stopPostgres(pgServer.dataDir);
    rmSync(pgServer.dataDir, { recursive: true, force: true });
  }
}

main()
  .then((code) => process.exit(code))
  .catch(async (err) => {
    console.error('[test] set-up failed:', err instanceof Error ? err.stack : err);
    await stopServices();
    console.log('0 passed, 1 failed');
    process.exit(1);
  });
