import type pg from 'pg';
import { drizzle } from 'drizzle-orm/node-postgres';
import { migrate } from 'drizzle-orm/node-postgres/migrator';
import type { DatabaseHandle } from './client.ts';
import { MIGRATIONS_FOLDER } from './client.ts';
import { openPool } from './pgPool.ts';
import * as schema from './schema/index.ts';

// The scale-out path (issue 7): a PostgreSQL server through node-postgres, same schema and
// migrations as the embedded default. Imported lazily so the embedded default never loads pg.

/** Arbitrary constant shared by every Rollway process migrating the same server. */
const MIGRATION_LOCK_KEY = 4_600_001;

export async function openPostgres(databaseUrl: string): Promise<DatabaseHandle> {
  // A connection the server closes (a restart) fails the statement using it; nothing else to do.
  const pool = openPool(databaseUrl, { name: 'rollway' }, () => undefined);
  try {
    await migrateUnderLock(pool);
  } catch (error) {
    await pool.end();
    throw error;
  }
  const db = drizzle({ client: pool, schema, casing: 'snake_case' });
  return { db, close: () => pool.end() };
}

/**
 * drizzle's migrator takes no lock, and the server and every worker migrate at start; an
 * advisory lock makes the others wait and then find nothing left to apply.
 */
async function migrateUnderLock(pool: pg.Pool): Promise<void> {
  const client = await pool.connect();
  try {
    await client.query('select pg_advisory_lock($1)', [MIGRATION_LOCK_KEY]);
    try {
      await migrate(drizzle({ client, casing: 'snake_case' }), { migrationsFolder: MIGRATIONS_FOLDER });
    } finally {
      await client.query('select pg_advisory_unlock($1)', [MIGRATION_LOCK_KEY]);
    }
  } finally {
    client.release();
  }
}
