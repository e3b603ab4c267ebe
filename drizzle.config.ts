import { defineConfig } from 'drizzle-kit';

// `npx drizzle-kit generate` writes migrations to server/drizzle/; they are committed and
// applied at start by server/db/client.ts. No credentials here: generate needs none.
export default defineConfig({
  dialect: 'postgresql',
  schema: './server/db/schema/index.ts',
  out: './server/drizzle',
  casing: 'snake_case',
  strict: true,
  verbose: true,
});
