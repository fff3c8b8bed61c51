// Backups of the database with Debian PostgreSQL's pg_dump and pg_restore (custom format).
//   npm run db:backup [FILE]   dumps DATABASE_URL (default: the npm start database) to FILE, or to
//                              .data/backups/seasonwell-<UTC time>.dump
//   npm run db:restore FILE    restores FILE into DATABASE_URL, replacing what is there
// Uploaded files are not in the database: they live in STORAGE_DIR or the S3 bucket.
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { existsSync, mkdirSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import pg from 'pg';
import { loadConfig } from '../server/config';
import { clusterHome, ensureCluster, findPgBin, isReady, stopCluster } from './lib/pg.mjs';

const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '..');
export const BACKUP_DIR = join(ROOT, '.data', 'backups');

function pgBin(): string {
  const bin = findPgBin();
  if (!bin) throw new Error('PostgreSQL is not installed: pg_dump and pg_restore come with Debian\'s "postgresql" package (apt-get install -y postgresql).');
  return bin;
}

/**
 * The client tools run as whoever runs the script and connect as the role in the URL. The server
 * side needs no OS user: only initdb and postgres refuse root. A URL without a role would make
 * libpq log in as the OS user, and our clusters have no "root" role, so root falls back to postgres.
 */
function toolEnv(url: string): NodeJS.ProcessEnv {
  const env = { ...process.env };
  if (!new URL(url).username && process.getuid?.() === 0) env.PGUSER ??= 'postgres';
  return env;
}

function tool(name: 'pg_dump' | 'pg_restore', args: string[], url: string): void {
  const r = spawnSync(join(pgBin(), name), args, { stdio: ['ignore', 'inherit', 'inherit'], env: toolEnv(url), cwd: ROOT });
  if (r.error) throw r.error;
  if (r.status !== 0) throw new Error(`${name} failed (exit ${r.status})`);
}

/** A file name that sorts by time: seasonwell-2026-12-02T07-15-00Z.dump */
export function defaultBackupFile(now = new Date()): string {
  return join(BACKUP_DIR, `seasonwell-${now.toISOString().slice(0, 19).replace(/:/g, '-')}Z.dump`);
}

/** Dumps the whole database (every schema, pg-boss's included) in pg_dump's custom format. */
export function backupDatabase(url: string, file: string = defaultBackupFile()): string {
  mkdirSync(dirname(resolve(file)), { recursive: true });
  // --no-password: fail at once instead of prompting when the URL carries no usable credentials.
  tool('pg_dump', ['--format=custom', '--no-password', `--file=${resolve(file)}`, `--dbname=${url}`], url);
  return resolve(file);
}

/** Creates the database named in the URL when it does not exist yet (through the postgres database). */
async function ensureDatabase(url: string): Promise<void> {
  const name = decodeURIComponent(new URL(url).pathname.slice(1));
  const admin = new URL(url);
  admin.pathname = '/postgres';
  const client = new pg.Client({ connectionString: admin.toString(), user: admin.username || (process.getuid?.() === 0 ? 'postgres' : undefined) });
  await client.connect();
  try {
    const found = await client.query('select 1 from pg_database where datname = $1', [name]);
    if (!found.rowCount) await client.query(`create database "${name.replace(/"/g, '""')}"`);
  } finally {
    await client.end();
  }
}

/** Schemas the dump creates, from its table of contents (pg_restore --list). */
function dumpSchemas(file: string): string[] {
  const r = spawnSync(join(pgBin(), 'pg_restore'), ['--list', file], { encoding: 'utf8', cwd: ROOT });
  if (r.status !== 0) throw new Error(`pg_restore could not read ${file}: ${r.stderr.trim()}`);
  return [...r.stdout.matchAll(/^\d+; \d+ \d+ SCHEMA - (\S+) /gm)].map((m) => m[1]!);
}

function exited(child: ChildProcess, name: string): Promise<void> {
  return new Promise((resolve, reject) => {
    child.once('error', reject);
    child.once('exit', (code) => (code === 0 ? resolve() : reject(new Error(`${name} failed (exit ${code})`))));
  });
}

const quoteIdent = (name: string) => `"${name.replace(/"/g, '""')}"`;

/**
 * Restores a dump into the database, dropping each object it holds first (--clean --if-exists),
 * all in one transaction: a restore that fails part way leaves the database as it was.
 * pg_restore writes the script and psql runs it, so the script can start by dropping the schemas
 * other than public that the dump recreates whole (pg-boss's): --clean alone cannot drop the
 * primary keys of pg-boss's partitioned tables, which the partitions inherit.
 */
export async function restoreDatabase(url: string, file: string): Promise<void> {
  if (!existsSync(file)) throw new Error(`no backup file at ${file}`);
  const prelude = [
    'SET client_min_messages = warning;',
    ...dumpSchemas(file)
      .filter((s) => s !== 'public')
      .map((s) => `DROP SCHEMA IF EXISTS ${quoteIdent(s)} CASCADE;`),
  ].join('\n');
  await ensureDatabase(url);
  const bin = pgBin();
  const env = toolEnv(url);
  const psql = spawn(join(bin, 'psql'), ['--no-psqlrc', '--quiet', '--single-transaction', '--set=ON_ERROR_STOP=1', '--no-password', `--dbname=${url}`, '--file=-'], {
    stdio: ['pipe', 'ignore', 'inherit'],
    env,
    cwd: ROOT,
  });
  // --no-owner: the objects belong to whoever restores, so a dump moves between roles.
  const script = spawn(join(bin, 'pg_restore'), ['--clean', '--if-exists', '--no-owner', '--file=-', resolve(file)], { stdio: ['ignore', 'pipe', 'inherit'], env, cwd: ROOT });
  psql.stdin!.write(`${prelude}\n`);
  script.stdout!.pipe(psql.stdin!);
  await Promise.all([exited(script, 'pg_restore'), exited(psql, 'psql (running the restore)')]);
}

/**
 * npm start's own cluster (.data/pg) is started for the time of the command when it is not
 * running, so a backup or restore works with the app stopped. Any other database must be up.
 */
async function withDatabase<T>(url: string, work: () => Promise<T>): Promise<T> {
  const u = new URL(url);
  const port = Number(u.port || 5432);
  const home = clusterHome(ROOT, 'pg');
  const local = ['127.0.0.1', 'localhost'].includes(u.hostname) && existsSync(join(home, 'data', 'PG_VERSION'));
  if (!local || isReady(pgBin(), port)) return work();
  const { started } = await ensureCluster({ home, port, durable: true });
  try {
    return await work();
  } finally {
    if (started) stopCluster({ home });
  }
}

async function main(): Promise<number> {
  const [command, file] = process.argv.slice(2);
  const url = loadConfig().DATABASE_URL;
  const where = (() => {
    const u = new URL(url);
    return `${u.hostname}:${u.port || 5432}${u.pathname}`;
  })();
  if (command === 'backup') {
    const out = await withDatabase(url, async () => backupDatabase(url, file ?? defaultBackupFile()));
    console.log(`[backup] ${where} saved to ${out}`);
    console.log('[backup] uploaded files are not in it: copy the storage folder or bucket as well');
    return 0;
  }
  if (command === 'restore') {
    if (!file) {
      console.error('usage: npm run db:restore FILE   (replaces the contents of the database; see .data/backups/ for files)');
      return 2;
    }
    await withDatabase(url, () => restoreDatabase(url, file));
    console.log(`[restore] ${file} restored into ${where}`);
    return 0;
  }
  console.error('usage: tsx scripts/db-backup.ts backup [FILE] | restore FILE');
  return 2;
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  main().then(
    (code) => process.exit(code),
    (err: unknown) => {
      console.error(`[db] ${err instanceof Error ? err.message : String(err)}`);
      process.exit(1);
    },
  );
}
