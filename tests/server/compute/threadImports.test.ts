import { fileURLToPath } from 'node:url';
import { build } from 'esbuild';
import { describe, expect, it } from 'vitest';

// Compute threads get potentials as generated code (shared/physics/potential/portable.ts), so
// the expression compiler and the plan parser stay in the server: mathjs alone is ~30 MB of heap
// per thread. Bundling the thread's entry the way workerBundle.ts does shows what it loads.
const ENTRY = fileURLToPath(new URL('../../../server/compute/batch.worker.ts', import.meta.url));

describe('a compute thread', () => {
  it('loads neither mathjs nor the plan parser', async () => {
    const { metafile } = await build({ entryPoints: [ENTRY], bundle: true, write: false, platform: 'node', format: 'esm', packages: 'external', metafile: true, logLevel: 'silent' });
    const packages = new Set(Object.values(metafile.inputs).flatMap((input) => input.imports.filter((i) => i.external).map((i) => i.path)));
    expect([...packages].sort()).toEqual(['node:crypto', 'odex', 'zod']);
    const modules = Object.keys(metafile.inputs);
    expect(modules.filter((m) => /potential\/(expression|syntax|codegen)\.ts$|plan\/(planText|validatePlan)\.ts$/.test(m))).toEqual([]);
  });
});
