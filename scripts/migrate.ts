// Applies the committed migrations in drizzle/ (idempotent).
import { migrate } from 'drizzle-orm/node-postgres/migrator';
import { closeDb, db } from '../src/db';

export async function runMigrations(): Promise<void> {
  await migrate(db(), { migrationsFolder: new URL('../drizzle', import.meta.url).pathname });
}

if (import.meta.url === `file://${process.argv[1]}`) {
  runMigrations()
    .then(() => console.log('[migrate] database is up to date'))
    .catch((err) => {
      console.error('[migrate] failed:', err);
      process.exitCode = 1;
    })
    .finally(() => closeDb());
}
