import vue from '@vitejs/plugin-vue';
import vuetify from 'vite-plugin-vuetify';
import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';

const here = (path: string) => fileURLToPath(new URL(path, import.meta.url));

/**
 * The web app's build (root web/, output dist/web, served by the API server) and the test runner:
 * node tests for shared/, server/ and cli/, and component/store tests of web/ in happy-dom.
 */
export default defineConfig({
  root: here('./web'),
  plugins: [vue(), vuetify({ autoImport: true })],
  resolve: { alias: { '@': here('./web/src') } },
  build: { outDir: here('./dist/web'), emptyOutDir: true, chunkSizeWarningLimit: 2000 },
  server: { proxy: { '/api': 'http://127.0.0.1:4600' } },
  test: {
    root: here('.'),
    testTimeout: 60_000,
    // Hooks start real servers (PGlite initdb, worker bundle, argon2): seconds on a busy machine.
    hookTimeout: 60_000,
    projects: [
      { extends: true, test: { name: 'node', include: ['tests/**/*.test.ts'], exclude: ['tests/web/**'], environment: 'node' } },
      { extends: true, test: { name: 'web', include: ['tests/web/**/*.test.ts'], environment: 'happy-dom', server: { deps: { inline: ['vuetify'] } } } },
    ],
  },
});
