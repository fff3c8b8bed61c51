import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import pg from 'pg';
import PgBoss from 'pg-boss';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { inject } from 'vitest';
import { backupDatabase, restoreDatabase } from '../scripts/db-backup';
import { dropDatabase, findPgBin } from '../scripts/lib/pg.mjs';
import { createDatabase } from '../server/db/client';
import { runMigrations } from '../server/db/migrate';
import { seedDemo } from '../server/db/seed/seed';

// A database of its own, so the other test files writing to the shared one cannot change the counts.
const base = new URL(inject('databaseUrl'));
const port = Number(base.port);
const suffix = `${process.pid}_${Date.now().toString(36)}`;
const nameOf = (kind: string) => `sw_backup_${kind}_${suffix}`;
const urlOf = (name: string) => {
  const u = new URL(base);
  u.pathname = `/${name}`;
  return u.toString();
};
const source = urlOf(nameOf('src'));
const target = urlOf(nameOf('dst'));
const dir = mkdtempSync(join(tmpdir(), 'seasonwell-backup-'));
const SESSION_ID = 'backup-test-session';

/** Row count of every table in the app's schema and pg-boss's, keyed "schema.table". */
async function rowCounts(url: string): Promise<Record<string, number>> {
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  try {
    const tables = await client.query<{ s: string; t: string }>(
      `select table_schema as s, table_name as t from information_schema.tables
       where table_schema in ('public', 'pgboss') and table_type = 'BASE TABLE' order by 1, 2`,
    );
    const counts: Record<string, number> = {};
    for (const { s, t } of tables.rows) {
      const r = await client.query<{ n: string }>(`select count(*)::text as n from "${s}"."${t}"`);
      counts[`${s}.${t}`] = Number(r.rows[0]!.n);
    }
    return counts;
  } finally {
    await client.end();
  }
}

describe('database backup and restore', () => {
  beforeAll(async () => {
    await runMigrations(source);
    const database = createDatabase(source, 2);
    await seedDemo(database.db);
    // A stored sign-in, to show what a restore does to sessions.
    await database.pool.query(`insert into session (sid, sess, expire) values ($1, $2, now() + interval '1 day')`, [
      SESSION_ID,
      JSON.stringify({ cookie: {}, passport: { user: 'x' } }),
    ]);
    await database.close();
    // pg-boss keeps its queues in a schema of its own in the same database; give it a job.
    const boss = new PgBoss({ connectionString: source, schema: 'pgboss', max: 2 });
    boss.on('error', () => {});
    await boss.start();
    await boss.createQueue('backup-check');
    await boss.send('backup-check', { n: 1 });
    await boss.stop({ graceful: false, wait: true });
  }, 120_000);

  afterAll(() => {
    const bin = findPgBin();
    if (bin) for (const name of [nameOf('src'), nameOf('dst')]) dropDatabase(bin, port, name);
    rmSync(dir, { recursive: true, force: true });
  });

  it('round-trips the demo database into a fresh one with the same rows in every table', async () => {
    const file = backupDatabase(source, join(dir, 'demo.dump'));
    expect(existsSync(file)).toBe(true);
    // pg_dump's custom format starts with this signature.
    expect(readFileSync(file).subarray(0, 5).toString('latin1')).toBe('PGDMP');

    await restoreDatabase(target, file);
    const before = await rowCounts(source);
    const after = await rowCounts(target);
    expect(Object.keys(before).length).toBeGreaterThan(20);
    expect(Object.keys(before).some((t) => t.startsWith('pgboss.'))).toBe(true);
    expect(before['public.customers']).toBe(40);
    expect(after).toEqual(before);

    // Sessions are rows in the database: a restore brings back the ones stored at backup time.
    const client = new pg.Client({ connectionString: target });
    await client.connect();
    const kept = await client.query(`select 1 from session where sid = $1`, [SESSION_ID]);
    await client.end();
    expect(kept.rowCount).toBe(1);
  }, 120_000);

  it('restores over a database that already holds data without doubling a row', async () => {
    const file = join(dir, 'demo.dump');
    const client = new pg.Client({ connectionString: target });
    await client.connect();
    await client.query(`delete from session`);
    await client.query(`insert into customers (name, email, phone) values ('After the backup', 'after.backup@example.test', '+18165550199')`);
    await client.end();

    await restoreDatabase(target, file);
    expect(await rowCounts(target)).toEqual(await rowCounts(source));
  }, 120_000);

  it('refuses a file that is not there', async () => {
    await expect(restoreDatabase(target, join(dir, 'missing.dump'))).rejects.toThrow(/no backup file/);
  });
});
