// Builds the CLI (and the server it starts) into one ES module with esbuild, for the long-running
// commands: run from a bundle, the process carries no tsx loader isolate (~70 MB measured).
import { createHash } from 'node:crypto';
import { readFile } from 'node:fs/promises';
import { mkdir, readdir, rm, stat, writeFile } from 'node:fs/promises';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { build } from 'esbuild';

const ENTRY = fileURLToPath(new URL('./index.ts', import.meta.url));
// Inside node_modules so the bundle's bare imports resolve to the project's packages.
const CACHE = fileURLToPath(new URL('../node_modules/.cache/rollway/', import.meta.url));

// Modules find their data (migrations, examples, the web build, the worker entry) next to their
// source file: each keeps its own import.meta.url, as if it ran unbundled.
const ownUrl = {
  name: 'own-import-meta-url',
  setup(b) {
    b.onLoad({ filter: /\.ts$/ }, async (args) => {
      const source = await readFile(args.path, 'utf8');
      return { contents: source.replaceAll('import.meta.url', JSON.stringify(pathToFileURL(args.path).href)), loader: 'ts' };
    });
  },
};

/** The bundle's file URL; built anew only when the sources changed (named by content hash). */
export async function bundleCli() {
  const result = await build({
    entryPoints: [ENTRY], bundle: true, write: false, platform: 'node', format: 'esm', target: 'node20',
    packages: 'external', logLevel: 'warning', plugins: [ownUrl],
  });
  const code = result.outputFiles[0].contents;
  const name = `cli.${createHash('sha256').update(code).digest('hex').slice(0, 16)}.mjs`;
  await mkdir(CACHE, { recursive: true });
  const file = `${CACHE}${name}`;
  if (!(await stat(file).catch(() => undefined))) await writeFile(file, code);
  await removeStale(name);
  return pathToFileURL(file).href;
}

/** Bundles of older sources, a day unused (a server of that version may still be running). */
async function removeStale(current) {
  const dayAgo = Date.now() - 86_400_000;
  for (const other of await readdir(CACHE)) {
    if (!/^cli\.[0-9a-f]{16}\.mjs$/.test(other) || other === current) continue;
    const info = await stat(`${CACHE}${other}`).catch(() => undefined);
    if (info && info.atimeMs < dayAgo) await rm(`${CACHE}${other}`, { force: true });
  }
}
