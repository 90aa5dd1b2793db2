// `npm start`: database, migrations, demo data, build, then every process of the product.
// Ctrl-C stops all of it, PostgreSQL included; the data stays for the next start.
import { startConfig, processEnv } from './lib/config';
import { prepare } from './lib/prepare';
import { storeDemoDocuments } from './seed';
import { startService, stopServices } from './lib/processes';
import { productServices } from './lib/services';
import { stopPostgres } from './lib/postgres';
import { demoAccounts } from '../src/lib/demo/scenario';

async function main(): Promise<void> {
  const c = startConfig();
  const pgServer = await prepare(c, { throwaway: false });
  Object.assign(process.env, processEnv(c, pgServer.url, 'production'));

  let shuttingDown = false;
  const shutdown = async (code: number) => {
    if (shuttingDown) return;
    shuttingDown = true;
    console.log('\n[heatlayer] stopping…');
    await stopServices();
    stopPostgres(pgServer.dataDir);
    console.log('[heatlayer] stopped.');
    process.exit(code);
  };
  process.on('SIGINT', () => void shutdown(0));
  process.on('SIGTERM', () => void shutdown(0));

  for (const spec of productServices(c)) {
    await startService(spec, (name, code) => {
      console.error(`[heatlayer] ${name} exited unexpectedly (code ${code}); stopping everything.`);
      void shutdown(1);
    });
  }
  // The demo's commissioning documents, once object storage is up (scripts/seed.ts; only what is
  // missing). In the background: the product is usable meanwhile, the records' rows are already there.
  storeDemoDocuments().catch((err) =>
    console.error('[seed] demo documents not stored:', err instanceof Error ? err.message : err),
  );

  const url = `http://localhost:${c.webPort}`;
  console.log(`\nHeatlayer is running at ${url}\n`);
  console.log(`Demo sign-ins (password "${c.demoPassword}"; demo only, change them before real use):`);
  for (const a of demoAccounts()) console.log(`  ${a.email.padEnd(36)} ${a.role}`);
  console.log('\nPress Ctrl-C to stop.');
}

main().catch(async (err) => {
  console.error('[heatlayer] start failed:', err instanceof Error ? err.message : err);
  await stopServices();
  process.exit(1);
});
