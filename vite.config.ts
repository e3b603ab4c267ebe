import { defineConfig } from 'vitest/config';

// One config for the test runner now; the web app's build joins it when web/ exists.
export default defineConfig({
  test: {
    include: ['tests/**/*.test.ts'],
    testTimeout: 60_000,
  },
});
