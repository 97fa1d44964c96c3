import { defineConfig } from 'drizzle-kit';

// `npm run db:generate` writes a new migration from server/db/schema.ts into migrations/.
// Review it and commit it; never edit a committed migration.
export default defineConfig({
  dialect: 'postgresql',
  schema: './server/db/schema.ts',
  out: './migrations',
  casing: 'snake_case',
  dbCredentials: { url: process.env.DATABASE_URL ?? 'postgres://app@127.0.0.1:54330/tuckline' },
});
