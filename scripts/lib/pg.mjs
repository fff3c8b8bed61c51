// PostgreSQL lifecycle for npm start and npm test. Built-ins only: this runs before node_modules exists.
import { execFileSync, spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, readdirSync, chownSync, rmSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { setTimeout as sleep } from 'node:timers/promises';

const isRoot = process.getuid?.() === 0;

function log(msg) {
  process.stdout.write(`[postgres] ${msg}\n`);
}

/** Newest Debian PostgreSQL bin folder, or null. */
export function findPgBin() {
  const base = '/usr/lib/postgresql';
  if (!existsSync(base)) return null;
  const versions = readdirSync(base)
    .filter((v) => existsSync(join(base, v, 'bin', 'initdb')))
    .sort((a, b) => Number(b) - Number(a));
  return versions.length ? join(base, versions[0], 'bin') : null;
}

/** Installs Debian's postgresql package when it is missing. */
export function ensurePostgresInstalled() {
  let bin = findPgBin();
  if (bin) return bin;
  if (!isRoot) throw new Error('PostgreSQL is not installed. Install Debian\'s "postgresql" package (apt-get install -y postgresql).');
  log('installing Debian package postgresql (one time)…');
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  execFileSync('apt-get', ['update', '-qq'], { stdio: 'inherit', env });
  execFileSync('apt-get', ['install', '-y', '-qq', 'postgresql', 'postgresql-contrib'], { stdio: 'inherit', env });
  bin = findPgBin();
  if (!bin) throw new Error('postgresql was installed but initdb was not found under /usr/lib/postgresql');
  return bin;
}

/** Runs a PostgreSQL tool as the postgres user when we are root (initdb and postgres refuse root). */
function pgRun(bin, tool, args, opts = {}) {
  const cmd = join(bin, tool);
  const [file, argv] = isRoot ? ['runuser', ['-u', 'postgres', '--', cmd, ...args]] : [cmd, args];
  return spawnSync(file, argv, { encoding: 'utf8', cwd: '/', ...opts });
}

function canPostgresReach(dir) {
  if (!isRoot) return true;
  const r = spawnSync('runuser', ['-u', 'postgres', '--', 'test', '-x', dir], { cwd: '/' });
  return r.status === 0;
}

/**
 * Where a cluster lives. Inside the project (.data/<name>) when the postgres user can enter every
 * parent folder; otherwise under /var/tmp, keyed by the project path.
 */
export function clusterHome(projectRoot, name) {
  const inProject = join(projectRoot, '.data');
  mkdirSync(inProject, { recursive: true });
  if (canPostgresReach(inProject)) return join(inProject, name);
  const hash = createHash('sha256').update(resolve(projectRoot)).digest('hex').slice(0, 12);
  const outside = `/var/tmp/seasonwell-${hash}`;
  mkdirSync(outside, { recursive: true, mode: 0o755 });
  return join(outside, name);
}

function ownByPostgres(dir) {
  if (!isRoot) return;
  const uid = Number(execFileSync('id', ['-u', 'postgres'], { encoding: 'utf8' }).trim());
  const gid = Number(execFileSync('id', ['-g', 'postgres'], { encoding: 'utf8' }).trim());
  chownSync(dir, uid, gid);
}

export function isReady(bin, port) {
  const r = spawnSync(join(bin, 'pg_isready'), ['-h', '127.0.0.1', '-p', String(port), '-q'], { cwd: '/' });
  return r.status === 0;
}

function isRunning(bin, dataDir) {
  return pgRun(bin, 'pg_ctl', ['status', '-D', dataDir]).status === 0;
}

/**
 * Ensures a cluster in `home` runs on 127.0.0.1:port. Returns { started } where started tells
 * whether this call started it (and so should stop it).
 * durable=false turns off fsync and friends: for throw-away test clusters only.
 */
export async function ensureCluster({ home, port, durable = true }) {
  const bin = ensurePostgresInstalled();
  const dataDir = join(home, 'data');
  const sockDir = join(home, 'run');
  const logFile = join(home, 'postgres.log');
  mkdirSync(home, { recursive: true });
  mkdirSync(sockDir, { recursive: true });
  ownByPostgres(home);
  ownByPostgres(sockDir);

  if (!existsSync(join(dataDir, 'PG_VERSION'))) {
    if (existsSync(dataDir)) rmSync(dataDir, { recursive: true, force: true });
    log(`creating cluster in ${dataDir}`);
    const r = pgRun(bin, 'initdb', ['-D', dataDir, '-U', 'postgres', '--auth=trust', '-E', 'UTF8', '--locale=C.UTF-8']);
    if (r.status !== 0) throw new Error(`initdb failed:\n${r.stdout}\n${r.stderr}`);
  }

  if (isRunning(bin, dataDir) && isReady(bin, port)) return { started: false, dataDir, bin };

  const opts = [
    `-c listen_addresses=127.0.0.1`,
    `-p ${port}`,
    `-k ${sockDir}`,
    ...(durable ? [] : ['-c fsync=off', '-c synchronous_commit=off', '-c full_page_writes=off']),
    '-c max_connections=200',
  ].join(' ');

  // After a kill -9 the old postmaster's children linger for a few seconds: retry.
  let lastErr = '';
  for (let attempt = 0; attempt < 15; attempt++) {
    const r = pgRun(bin, 'pg_ctl', ['start', '-D', dataDir, '-l', logFile, '-w', '-t', '30', '-o', opts]);
    if (r.status === 0 && isReady(bin, port)) {
      log(`running on 127.0.0.1:${port}`);
      return { started: true, dataDir, bin };
    }
    lastErr = `${r.stdout}\n${r.stderr}\n${tail(logFile)}`;
    if (isRunning(bin, dataDir) && isReady(bin, port)) return { started: true, dataDir, bin };
    await sleep(1000);
  }
  throw new Error(`PostgreSQL did not start on port ${port}:\n${lastErr}`);
}

function tail(file) {
  try {
    return readFileSync(file, 'utf8').split('\n').slice(-15).join('\n');
  } catch {
    return '';
  }
}

export function stopCluster({ home }) {
  const bin = findPgBin();
  if (!bin) return;
  const dataDir = join(home, 'data');
  if (!existsSync(join(dataDir, 'PG_VERSION'))) return;
  pgRun(bin, 'pg_ctl', ['stop', '-D', dataDir, '-m', 'fast', '-w', '-t', '30']);
}

/** Runs SQL as the postgres superuser over TCP. */
export function psql(bin, port, sql, db = 'postgres') {
  const r = spawnSync(join(bin, 'psql'), ['-h', '127.0.0.1', '-p', String(port), '-U', 'postgres', '-d', db, '-v', 'ON_ERROR_STOP=1', '-qAtc', sql], {
    encoding: 'utf8',
    cwd: '/',
  });
  if (r.status !== 0) throw new Error(`psql failed: ${r.stderr}`);
  return r.stdout.trim();
}

export function createDatabase(bin, port, name) {
  const exists = psql(bin, port, `select 1 from pg_database where datname = '${name}'`);
  if (!exists) psql(bin, port, `create database "${name}"`);
}

export function dropDatabase(bin, port, name) {
  psql(bin, port, `drop database if exists "${name}" with (force)`);
}

export function databaseUrl(port, name) {
  return `postgres://postgres@127.0.0.1:${port}/${name}`;
}
