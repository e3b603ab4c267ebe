#!/usr/bin/env node
// Entry point of the `rollway` command. Short commands run the TypeScript sources through tsx's
// loader (no build step); the long-running ones (serve, worker) run from an esbuild bundle made
// at start, which spares the process tsx's loader isolate.
const command = process.argv.slice(2).find((a) => !a.startsWith('-'));
if ((command === 'serve' || command === 'worker') && process.env.ROLLWAY_FROM_SOURCE !== '1') {
  const { bundleCli } = await import('./bundleCli.mjs');
  await import(await bundleCli());
} else {
  const { register } = await import('tsx/esm/api');
  // tsconfig.json maps 'odex' to its type declarations for the type checker only; at run time
  // the real package must load, so tsx is told not to apply that mapping.
  register({ tsconfig: false });
  await import('./index.ts');
}
