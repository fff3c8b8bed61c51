import { migrate } from 'drizzle-orm/node-postgres/migrator';
import pg from 'pg';
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { withSessionLock } from './advisory-lock';
import { createDatabase } from './client';

// From the source (server/db/) the folder is ../../migrations; compiled, every entry is a file in
// dist/server/ and the build copies the folder to dist/migrations, which is ../migrations.
function migrationsFolder(): string {
  const candidates = [new URL('../migrations', import.meta.url), new URL('../../migrations', import.meta.url)].map((u) => fileURLToPath(u));
  const found = candidates.find((dir) => existsSync(join(dir, 'meta', '_journal.json')));
  if (!found) throw new Error(`no migrations folder found (looked in ${candidates.join(', ')})`);
  return found;
}
// Any fixed number: every process migrating this database takes the same lock.
const MIGRATION_LOCK = 7_311_204;

/** Creates the database named in the URL when it does not exist yet. */
export async function ensureDatabaseExists(url: string): Promise<void> {
  const target = new URL(url);
  const name = decodeURIComponent(target.pathname.slice(1));
  const admin = new URL(url);
  admin.pathname = '/postgres';
  const client = new pg.Client({ connectionString: admin.toString() });
  await client.connect();
  try {
    const found = await client.query('select 1 from pg_database where datname = $1', [name]);
    if (found.rowCount === 0) {
      try {
        await client.query(`create database "${name.replace(/"/g, '""')}"`);
      } catch (err) {
        // Another process created it first: 42P04 once its row is visible, 23505 on the catalog's
        // unique index while both creations are still in flight.
        const code = (err as { code?: string }).code;
        if (code !== '42P04' && code !== '23505') throw err;
      }
    }
  } finally {
    await client.end();
  }
}

/** Runs pending migrations. migrate() takes no lock of its own, so we hold an advisory lock. */
export async function runMigrations(url: string): Promise<void> {
  await ensureDatabaseExists(url);
  const database = createDatabase(url, 1);
  try {
    await withSessionLock(url, MIGRATION_LOCK, () => migrate(database.db, { migrationsFolder: migrationsFolder() }));
  } finally {
    await database.close();
  }
}
