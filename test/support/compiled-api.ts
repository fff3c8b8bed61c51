// The compiled API (dist/server/main.js) in a process of its own, as production runs it.
import { spawn, type ChildProcess } from 'node:child_process';
import { join } from 'node:path';
import { setTimeout as sleep } from 'node:timers/promises';
import { ROOT, freePort } from '../../scripts/lib/proc.mjs';

export interface CompiledApi {
  child: ChildProcess;
  port: number;
  url: string;
  /** What the process has written so far, stdout and stderr together. */
  output: () => string;
}

/**
 * Starts the compiled API on a free port with mail pointed nowhere; resolves once its health route
 * answers, rejects if it exits first. `env` adds to (or overrides) the test settings.
 */
export async function startCompiledApi(env: { DATABASE_URL: string; STORAGE_DIR: string } & Record<string, string>, pollMs = 100): Promise<CompiledApi> {
  const port = await freePort();
  const child = spawn(process.execPath, [join(ROOT, 'dist', 'server', 'main.js')], {
    cwd: ROOT,
    env: { PATH: process.env.PATH, NODE_ENV: 'test', HOST: '127.0.0.1', PORT: String(port), LOG_LEVEL: 'warn', SMTP_URL: 'smtp://127.0.0.1:9', ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let out = '';
  child.stdout!.on('data', (c) => (out += c));
  child.stderr!.on('data', (c) => (out += c));
  const api: CompiledApi = { child, port, url: `http://127.0.0.1:${port}`, output: () => out };
  for (let i = 0; i < 30_000 / pollMs; i++) {
    if (child.exitCode !== null) throw new Error(`the API exited ${child.exitCode}:\n${out}`);
    const up = await fetch(`${api.url}/api/health`).then(
      (r) => r.ok,
      () => false,
    );
    if (up) return api;
    await sleep(pollMs);
  }
  child.kill('SIGKILL');
  throw new Error(`the API did not answer:\n${out}`);
}
