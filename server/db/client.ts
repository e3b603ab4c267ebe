import { mkdir } from 'node:fs/promises';
import { resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { PGlite } from '@electric-sql/pglite';
import { drizzle as drizzlePglite } from 'drizzle-orm/pglite';
import { migrate as migratePglite } from 'drizzle-orm/pglite/migrator';
import type { PgDatabase, PgQueryResultHKT } from 'drizzle-orm/pg-core';
import { initClusterInChild, PGLITE_CONF } from './initCluster.ts';
import { useBaselineWasmCompiler } from './wasmCompiler.ts';
import * as schema from './schema/index.ts';

export type Schema = typeof schema;
/** Either driver's database; repositories take this so they run on PGlite and PostgreSQL alike. */
export type Database = PgDatabase<PgQueryResultHKT, Schema>;

export interface DatabaseHandle {
  db: Database;
  /** The embedded engine, for PGlite-only fast paths; undefined on a PostgreSQL server. */
  pglite?: PGlite;
  close(): Promise<void>;
}

export interface OpenDatabaseOptions {
  /** PGlite data directory (created if missing); undefined or 'memory://' keeps it in memory. */
  dataDir?: string;
  /** A PostgreSQL server (the scale-out path); takes precedence over dataDir. */
  databaseUrl?: string;
}

/** drizzle keeps the driver's client on the database object: the PGlite engine for PGlite-only fast paths. */
export function pgliteOf(db: Database): PGlite | undefined {
  const client = (db as { $client?: unknown }).$client;
  return client instanceof PGlite ? client : undefined;
}

// Resolved from this module, not the cwd, so the CLI and tests can start from any directory.
export const MIGRATIONS_FOLDER = fileURLToPath(new URL('../drizzle/', import.meta.url));

const MEMORY = 'memory://';

/** Opens the database and brings its schema up to date before anything else can use it. */
export async function openDatabase(options: OpenDatabaseOptions = {}): Promise<DatabaseHandle> {
  if (options.databaseUrl !== undefined) {
    const { openPostgres } = await import('./postgres.ts');
    return openPostgres(options.databaseUrl);
  }
  return openPglite(options.dataDir);
}

async function openPglite(dataDir: string | undefined): Promise<DatabaseHandle> {
  const inMemory = dataDir === undefined || dataDir === MEMORY;
  let location = MEMORY;
  if (!inMemory) {
    location = resolve(dataDir);
    await mkdir(location, { recursive: true });
    await initClusterInChild(location);
  }
  useBaselineWasmCompiler();
  const pglite = new PGlite(location, { postgresqlconf: PGLITE_CONF });
  await pglite.waitReady;
  const db = drizzlePglite({ client: pglite, schema, casing: 'snake_case' });
  try {
    await migratePglite(db, { migrationsFolder: MIGRATIONS_FOLDER });
  } catch (error) {
    await pglite.close();
    throw error;
  }
  return { db, pglite, close: () => pglite.close() };
}
