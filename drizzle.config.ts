import { defineConfig } from 'drizzle-kit';

// Only `drizzle-kit generate` uses this file (it needs no database). Migrations are applied by
// server/db/migrate.ts at start, so the connection string is never read here.
export default defineConfig({
  dialect: 'postgresql',
  schema: './server/db/schema.ts',
  out: './drizzle',
});
