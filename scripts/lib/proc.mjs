// Process helpers for the start and test scripts. Built-ins only.
import { execFileSync, spawn } from 'node:child_process';
import { existsSync, readdirSync, statSync } from 'node:fs';
import { createServer } from 'node:net';
import { join } from 'node:path';
import { setTimeout as sleep } from 'node:timers/promises';

export const ROOT = new URL('../..', import.meta.url).pathname.replace(/\/$/, '');
export const BIN = join(ROOT, 'node_modules', '.bin');

export function say(msg) {
  process.stdout.write(`[seasonwell] ${msg}\n`);
}

/** Runs `npm ci` when node_modules is missing or older than the lock file. */
export function ensureDependencies() {
  const marker = join(ROOT, 'node_modules', '.package-lock.json');
  const lock = join(ROOT, 'package-lock.json');
  if (existsSync(marker) && statSync(marker).mtimeMs >= statSync(lock).mtimeMs) return;
  say('installing npm dependencies (npm ci)…');
  execFileSync('npm', ['ci', '--no-audit', '--no-fund'], { cwd: ROOT, stdio: 'inherit' });
}

/** Installs Debian's Chromium for the browser tests when it is missing. */
export function ensureChromium() {
  if (existsSync('/usr/bin/chromium')) return;
  if (process.getuid?.() !== 0) throw new Error('Chromium is missing: install Debian\'s "chromium" package (apt-get install -y chromium).');
  say('installing Debian package chromium (one time)…');
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  execFileSync('apt-get', ['update', '-qq'], { stdio: 'inherit', env });
  execFileSync('apt-get', ['install', '-y', '-qq', 'chromium'], { stdio: 'inherit', env });
}

/**
 * A TCP port nobody listens on right now, below the kernel's ephemeral range (32768 and up), so a
 * test's own short-lived listeners cannot take it between the choice and its use.
 */
export async function freePort() {
  for (let attempt = 0; attempt < 200; attempt++) {
    const port = 20000 + Math.floor(Math.random() * 10000);
    const ok = await new Promise((resolve) => {
      const srv = createServer();
      srv.unref();
      srv.once('error', () => resolve(false));
      srv.listen(port, '127.0.0.1', () => srv.close(() => resolve(true)));
    });
    if (ok) return port;
  }
  throw new Error('no free TCP port found between 20000 and 29999');
}

/** Runs a command to completion, inheriting output. Resolves with the exit code. */
export function run(cmd, args, opts = {}) {
  return new Promise((resolve) => {
    const child = spawn(cmd, args, { cwd: ROOT, stdio: 'inherit', ...opts });
    child.on('exit', (code, signal) => resolve(code ?? (signal ? 1 : 0)));
    child.on('error', () => resolve(1));
  });
}

/** Starts a long-running child whose output is prefixed with its name. */
export function startService(name, cmd, args, env) {
  const child = spawn(cmd, args, { cwd: ROOT, env: { ...process.env, ...env }, stdio: ['ignore', 'pipe', 'pipe'] });
  const prefix = (stream, out) => {
    let buf = '';
    stream.on('data', (chunk) => {
      buf += chunk;
      let nl;
      while ((nl = buf.indexOf('\n')) >= 0) {
        out.write(`[${name}] ${buf.slice(0, nl)}\n`);
        buf = buf.slice(nl + 1);
      }
    });
  };
  prefix(child.stdout, process.stdout);
  prefix(child.stderr, process.stderr);
  return child;
}

export async function waitForHttp(url, { timeoutMs = 60_000, child } = {}) {
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    if (child && (child.exitCode !== null || child.signalCode !== null)) throw new Error(`${url}: the process exited with code ${child.exitCode}`);
    try {
      const res = await fetch(url);
      if (res.ok) return;
    } catch {
      // not up yet
    }
    await sleep(250);
  }
  throw new Error(`${url} did not answer within ${timeoutMs / 1000} s`);
}

export function stopChild(child, signal = 'SIGTERM') {
  if (!child || child.exitCode !== null || child.signalCode !== null) return Promise.resolve();
  return new Promise((resolve) => {
    // Longer than the API's own 10 s drain of requests in flight.
    const timer = setTimeout(() => child.kill('SIGKILL'), 15_000);
    child.once('exit', () => {
      clearTimeout(timer);
      resolve();
    });
    child.kill(signal);
  });
}

/** Newest modification time of any file under the given paths. */
export function newestMtime(paths) {
  let newest = 0;
  const walk = (p) => {
    if (!existsSync(p)) return;
    const s = statSync(p);
    if (s.isDirectory()) {
      for (const entry of readdirSync(p)) if (entry !== 'node_modules') walk(join(p, entry));
    } else if (!p.endsWith('.spec.ts')) newest = Math.max(newest, s.mtimeMs);
  };
  for (const p of paths) walk(p);
  return newest;
}

/** Builds the client when any client source is newer than the last build. */
export async function buildClient({ force = false } = {}) {
  const index = join(ROOT, 'dist', 'seasonwell', 'browser', 'index.html');
  const sources = ['src', 'shared', 'public', 'angular.json', 'tsconfig.json', 'tsconfig.app.json', 'package-lock.json'].map((p) => join(ROOT, p));
  if (!force && existsSync(index) && statSync(index).mtimeMs >= newestMtime(sources)) {
    say('client build is up to date');
    return;
  }
  say('building the client…');
  const code = await run(join(BIN, 'ng'), ['build'], { env: { ...process.env, NG_CLI_ANALYTICS: 'false' } });
  if (code !== 0) throw new Error('the client build failed');
}

/** Compiles the server into dist/server when any server source is newer than the last build. */
export async function buildServer({ force = false } = {}) {
  const entry = join(ROOT, 'dist', 'server', 'main.js');
  const sources = ['server', 'shared', 'migrations', 'scripts/build-server.mjs', 'tsconfig.json', 'package-lock.json'].map((p) => join(ROOT, p));
  if (!force && existsSync(entry) && statSync(entry).mtimeMs >= newestMtime(sources)) {
    say('server build is up to date');
    return;
  }
  say('compiling the server…');
  const code = await run(process.execPath, [join(ROOT, 'scripts', 'build-server.mjs')]);
  if (code !== 0) throw new Error('the server build failed');
}
