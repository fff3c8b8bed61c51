import { defineConfig } from 'drizzle-kit';

export default defineConfig({
  dialect: 'postgresql',
  schema: './server/db/schema/index.ts',
  out: './migrations',
  casing: 'snake_case',
  // connect-pg-simple owns the session table; never let drizzle-kit drop it.
  tablesFilter: ['!session'],
  dbCredentials: { url: process.env.DATABASE_URL ?? 'postgres://postgres@127.0.0.1:55432/seasonwell' },
});
