import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { build } from 'vite';

const ROOT = process.cwd();
const OUT = join(ROOT, 'dist/web');
const STAMP = join(OUT, '.sources');
const LOCK = join(ROOT, 'node_modules/.cache/rollway/web-build.lock');
const SOURCES = ['web', 'shared', 'vite.config.ts'];

/** A digest of everything the build reads, so a build is redone only when a source changed. */
function sourceDigest(): string {
  const hash = createHash('sha256');
  const walk = (path: string): void => {
    if (statSync(path).isDirectory()) for (const name of readdirSync(path).sort()) walk(join(path, name));
    else hash.update(path).update(readFileSync(path));
  };
  for (const source of SOURCES) walk(join(ROOT, source));
  return hash.digest('hex');
}

async function withLock<T>(work: () => Promise<T>, timeoutMs = 180_000): Promise<T> {
  mkdirSync(join(LOCK, '..'), { recursive: true });
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    try {
      mkdirSync(LOCK); // atomic: only one process creates it
      break;
    } catch {
      // A lock left by a killed process is stale after the longest build we expect.
      const held = statSync(LOCK, { throwIfNoEntry: false });
      if (held && Date.now() - held.mtimeMs > 120_000) rmSync(LOCK, { recursive: true, force: true });
      if (Date.now() > deadline) throw new Error(`the web build lock ${LOCK} is still held after ${timeoutMs} ms`);
      await new Promise((r) => setTimeout(r, 250));
    }
  }
  try {
    return await work();
  } finally {
    rmSync(LOCK, { recursive: true, force: true });
  }
}

/**
 * Builds the web app into dist/web (where the server serves it from) unless the build there was
 * made from the same sources. E2E files run in parallel; the lock keeps their builds from emptying
 * dist/web under each other, and the digest makes all but the first one free.
 */
export async function ensureWebBuild(): Promise<void> {
  await withLock(async () => {
    const digest = sourceDigest();
    if (existsSync(STAMP) && readFileSync(STAMP, 'utf8') === digest && existsSync(join(OUT, 'index.html'))) return;
    await build({ configFile: join(ROOT, 'vite.config.ts'), logLevel: 'warn' });
    writeFileSync(STAMP, digest);
  });
}
