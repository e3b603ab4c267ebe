import { chmod, mkdir, readFile, rename, rm, writeFile } from 'node:fs/promises';
import { homedir } from 'node:os';
import { join } from 'node:path';
import { z } from 'zod';
import { InvalidInputError } from '../shared/errors.ts';

/**
 * Where `rollway login` keeps the credential: $XDG_CONFIG_HOME/rollway/credentials.json, else
 * ~/.config/rollway/credentials.json, readable by its owner only. ROLLWAY_URL and ROLLWAY_TOKEN
 * override the file (for scripts and CI), the file's token going only to the server it was made for.
 */

const storedSchema = z.object({
  url: z.string(),
  token: z.string(),
  kind: z.enum(['session', 'token']),
  email: z.string(),
});
export type StoredCredential = z.infer<typeof storedSchema>;

export interface Credential {
  url?: string;
  token?: string;
  /** Where the token came from: ROLLWAY_TOKEN, the login file, or nowhere. */
  source: 'env' | 'file' | 'none';
  stored?: StoredCredential;
}

export function credentialsPath(env: NodeJS.ProcessEnv = process.env): string {
  const base = env.XDG_CONFIG_HOME ? env.XDG_CONFIG_HOME : join(env.HOME ?? homedir(), '.config');
  return join(base, 'rollway', 'credentials.json');
}

export async function readStored(path = credentialsPath()): Promise<StoredCredential | undefined> {
  const text = await readFile(path, 'utf8').catch(() => undefined);
  if (text === undefined) return undefined;
  let data: unknown;
  try {
    data = JSON.parse(text);
  } catch {
    data = undefined;
  }
  const parsed = storedSchema.safeParse(data);
  if (!parsed.success) throw new InvalidInputError(`${path} is not a credential file written by rollway; remove it or run rollway login again`, 'credentials');
  return parsed.data;
}

/** Written to a temporary file made 0600 from the start, then renamed: never readable by others. */
export async function writeStored(credential: StoredCredential, path = credentialsPath()): Promise<void> {
  const dir = join(path, '..');
  await mkdir(dir, { recursive: true, mode: 0o700 });
  const temporary = `${path}.${process.pid}.tmp`;
  await writeFile(temporary, `${JSON.stringify(credential, null, 2)}\n`, { mode: 0o600 });
  await chmod(temporary, 0o600);
  await rename(temporary, path);
}

export async function removeStored(path = credentialsPath()): Promise<boolean> {
  const existed = (await readFile(path).catch(() => undefined)) !== undefined;
  await rm(path, { force: true });
  return existed;
}

export const sameServer = (a: string, b: string): boolean => a.replace(/\/+$/, '') === b.replace(/\/+$/, '');

/** Environment first, then the file. */
export async function resolveCredential(env: NodeJS.ProcessEnv = process.env): Promise<Credential> {
  const stored = await readStored(credentialsPath(env));
  const url = env.ROLLWAY_URL || stored?.url;
  if (env.ROLLWAY_TOKEN) return { url, token: env.ROLLWAY_TOKEN, source: 'env', stored };
  if (stored && url && sameServer(url, stored.url)) return { url, token: stored.token, source: 'file', stored };
  return { url, source: 'none', stored };
}
