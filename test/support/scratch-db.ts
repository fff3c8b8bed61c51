import pg from 'pg';
import { inject } from 'vitest';
import { runMigrations } from '../../server/db/migrate';

export interface ScratchDatabase {
  /** The migrated database's connection URL. */
  url: string;
  /** Drops it (closing whatever is still connected). */
  drop(): Promise<void>;
}

/**
 * A migrated database of a test file's own beside the shared one, for checks that count what
 * every other file's writes would disturb (statements, versions, report totals).
 */
export async function scratchDatabase(prefix: string): Promise<ScratchDatabase> {
  const admin = new pg.Client({ connectionString: inject('databaseUrl') });
  await admin.connect();
  const name = `sw_${prefix}_${process.pid}_${Date.now().toString(36)}`;
  await admin.query(`create database ${name}`);
  const url = new URL(inject('databaseUrl'));
  url.pathname = `/${name}`;
  await runMigrations(url.toString());
  return {
    url: url.toString(),
    drop: async () => {
      await admin.query(`drop database if exists ${name} with (force)`);
      await admin.end();
    },
  };
}
