// Direct access to the test database, for setting up and checking what the product stored.
import pg from 'pg';

let pool: pg.Pool | undefined;

function testDb(): pg.Pool {
  pool ??= new pg.Pool({ connectionString: process.env.DATABASE_URL, max: 3 });
  return pool;
}

export async function query<T extends pg.QueryResultRow = pg.QueryResultRow>(
  text: string,
  values: unknown[] = [],
): Promise<T[]> {
  return (await testDb().query<T>(text, values)).rows;
}

export async function closeTestDb(): Promise<void> {
  await pool?.end();
  pool = undefined;
}
