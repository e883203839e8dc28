import { defineConfig } from 'drizzle-kit';

export default defineConfig({
  dialect: 'postgresql',
  schema: './server/db/schema.ts',
  out: './drizzle',
  casing: 'snake_case',
  // Only `db:generate` uses this config; it needs no connection. Migrations are applied at
  // start-up by drizzle-orm's migrator (server/db/migrate.ts).
  dbCredentials: { url: process.env.DATABASE_URL ?? 'postgres://localhost/unused' },
});
