import { randomBytes } from 'node:crypto';
import { mkdir, readFile, writeFile } from 'node:fs/promises';
import { join } from 'node:path';

/**
 * The HMAC key that signs session JWTs: ROLLWAY_SESSION_SECRET when set (needed when several
 * servers share one PostgreSQL), else a random key kept in the data folder with 0600 permissions
 * so sessions survive a restart; an in-memory database gets an in-memory key.
 */
export async function loadSessionKey(options: { secret?: string; dataDir?: string; databaseUrl?: string }): Promise<Uint8Array> {
  if (options.secret) return new TextEncoder().encode(options.secret);
  const dir = options.databaseUrl || !options.dataDir || options.dataDir.startsWith('memory://') ? undefined : options.dataDir;
  if (!dir) return randomBytes(32);
  const file = join(dir, 'session.key');
  const stored = await readFile(file).catch(() => undefined);
  if (stored && stored.length >= 32) return stored;
  const key = randomBytes(32);
  await mkdir(dir, { recursive: true });
  await writeFile(file, key, { mode: 0o600 });
  return key;
}
