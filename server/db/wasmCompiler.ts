import { setFlagsFromString } from 'node:v8';

/**
 * Keeps PGlite's WebAssembly on V8's baseline compiler (Liftoff) instead of tiering hot functions
 * up to TurboFan. Measured on this 2-core machine (2026-12-02): the tier-up costs ~65 MB of
 * resident memory in the compiler threads' malloc arenas (PGlite alone: 207 MB → 138 MB) and
 * brings no measurable speed for our load: a 500-row result batch 30 ms against 33 ms, page
 * queries within noise. Wasm flags are read when a module is compiled, so this must run before
 * the first PGlite is created; it affects only WebAssembly, which nothing else in the server uses.
 */
let applied = false;
export function useBaselineWasmCompiler(): void {
  if (applied) return;
  setFlagsFromString('--liftoff-only');
  applied = true;
}
