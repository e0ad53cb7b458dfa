import { defineConfig } from 'drizzle-kit';

// Migrations are generated from the schema and committed; the server applies them at start-up
// (server/db/migrate.ts), on PGlite and on a real PostgreSQL server alike.
export default defineConfig({
  dialect: 'postgresql',
  schema: './server/db/schema.ts',
  out: './drizzle',
  casing: 'snake_case',
});
