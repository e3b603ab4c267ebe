import { execFile } from 'node:child_process';
import { readdir } from 'node:fs/promises';
import { promisify } from 'node:util';

/**
 * PostgreSQL settings for the embedded engine. The default 128 MB of shared buffers is sized for
 * a dedicated server; the embedded one shares the process with the API and the workers.
 */
export const PGLITE_CONF = ['shared_buffers=32MB'];

/**
 * Creating a new PGlite cluster (initdb) grows the WebAssembly memory to ~800 MB, which a
 * process never gives back. Doing it once in a short-lived child keeps the server's own peak at
 * what serving needs (~300 MB).
 */
export async function initClusterInChild(location: string): Promise<void> {
  const entries = await readdir(location).catch(() => []);
  if (entries.length > 0) return;
  const pglite = import.meta.resolve('@electric-sql/pglite');
  const script = `const { PGlite } = await import(${JSON.stringify(pglite)});
const db = new PGlite(${JSON.stringify(location)}); await db.waitReady; await db.close();`;
  await promisify(execFile)(process.execPath, ['--input-type=module', '-e', script]);
}
