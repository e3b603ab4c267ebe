import { mkdir, readdir, rm } from 'node:fs/promises';
import { fileURLToPath } from 'node:url';
import { build } from 'esbuild';

const ENTRY = fileURLToPath(new URL('./batch.worker.ts', import.meta.url));
// Inside node_modules so the bundle's bare imports (mathjs, odex, zod) resolve as usual.
const CACHE = fileURLToPath(new URL('../../node_modules/.cache/rollway/', import.meta.url));

/**
 * Worker threads load a bundle of our TypeScript made once at start, not the sources through
 * tsx: tsx's loader costs each thread a second isolate (~70 MB measured), which a pool pays
 * per worker. Packages stay external and load from node_modules.
 */
export async function buildWorkerBundle(): Promise<{ url: string; remove(): Promise<void> }> {
  await mkdir(CACHE, { recursive: true });
  await removeOrphans();
  const outfile = `${CACHE}batch.worker.${process.pid}.${Date.now()}.mjs`;
  await build({ entryPoints: [ENTRY], outfile, bundle: true, platform: 'node', format: 'esm', target: 'node20', packages: 'external', logLevel: 'warning' });
  return { url: new URL(`file://${outfile}`).href, remove: () => rm(outfile, { force: true }) };
}

const alive = (pid: number): boolean => {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    return (error as NodeJS.ErrnoException).code === 'EPERM';
  }
};

/** Bundles left by processes that were killed (kill -9 skips their clean-up). */
async function removeOrphans(): Promise<void> {
  for (const name of await readdir(CACHE)) {
    const pid = Number(/^batch\.worker\.(\d+)\./.exec(name)?.[1]);
    if (pid > 0 && !alive(pid)) await rm(`${CACHE}${name}`, { force: true });
  }
}
