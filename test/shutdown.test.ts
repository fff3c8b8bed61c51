// The compiled server as production runs it: started with plain Node, stopped with SIGTERM while a
// request is in flight. The request finishes, new connections are refused, and the process exits 0.
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { setTimeout as sleep } from 'node:timers/promises';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { inject } from 'vitest';
import { ROOT, buildServer, freePort } from '../scripts/lib/proc.mjs';

let port: number;
let child: ChildProcess;
let output = '';
let dbUrl: string;
const storage = mkdtempSync(join(tmpdir(), 'sw-shutdown-'));

function exited(p: ChildProcess): Promise<{ code: number | null; signal: NodeJS.Signals | null }> {
  if (p.exitCode !== null || p.signalCode !== null) return Promise.resolve({ code: p.exitCode, signal: p.signalCode });
  return new Promise((resolve) => p.once('exit', (code, signal) => resolve({ code, signal })));
}

async function waitForHealth(until = Date.now() + 60_000): Promise<void> {
  while (Date.now() < until) {
    if (child.exitCode !== null) throw new Error(`the server exited with ${child.exitCode}:\n${output}`);
    try {
      if ((await fetch(`http://127.0.0.1:${port}/api/health`)).ok) return;
    } catch {
      // not listening yet
    }
    await sleep(200);
  }
  throw new Error(`the server did not answer in time:\n${output}`);
}

async function adminQuery(sql: string): Promise<void> {
  const admin = new URL(dbUrl);
  admin.pathname = '/postgres';
  const client = new pg.Client({ connectionString: admin.toString() });
  await client.connect();
  try {
    await client.query(sql);
  } finally {
    await client.end();
  }
}

beforeAll(async () => {
  // npm test compiles the server first; a direct vitest run compiles it here when it is stale.
  await buildServer();
  // A database of its own, so this server's job workers never take another test file's jobs.
  const url = new URL(inject('databaseUrl'));
  url.pathname = `${url.pathname}_shutdown`;
  dbUrl = url.toString();
  port = await freePort();
  child = spawn(process.execPath, ['--enable-source-maps', join(ROOT, 'dist', 'server', 'main.js')], {
    cwd: ROOT,
    env: {
      PATH: process.env.PATH,
      NODE_ENV: 'test',
      HOST: '127.0.0.1',
      PORT: String(port),
      DATABASE_URL: dbUrl,
      LOG_LEVEL: 'info',
      SMTP_URL: 'smtp://127.0.0.1:9',
      STORAGE_DIR: storage,
      RUN_JOBS: 'true',
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  child.stdout!.on('data', (c) => (output += c));
  child.stderr!.on('data', (c) => (output += c));
  await waitForHealth();
}, 120_000);

afterAll(async () => {
  if (child && child.exitCode === null && child.signalCode === null) {
    child.kill('SIGKILL');
    await exited(child);
  }
  rmSync(storage, { recursive: true, force: true });
  if (dbUrl) await adminQuery(`drop database if exists "${new URL(dbUrl).pathname.slice(1)}" with (force)`);
});

describe('stopping the compiled server', () => {
  it('finishes the request in flight on SIGTERM, refuses new connections, then exits 0', async () => {
    const started = Date.now();
    const slow = fetch(`http://127.0.0.1:${port}/api/health/slow?ms=1500`).then(async (r) => ({
      status: r.status,
      body: (await r.json()) as { waitedMs: number; database: string },
    }));
    await sleep(300);
    const exit = exited(child);
    child.kill('SIGTERM');
    await sleep(300);

    // The listening socket is closed while the slow request still runs.
    await expect(fetch(`http://127.0.0.1:${port}/api/health`)).rejects.toThrow();
    const answer = await slow;
    expect(answer.status).toBe(200);
    // It still reached the database: the pool closes only after requests finish.
    expect(answer.body).toEqual({ waitedMs: 1500, database: 'up' });
    expect(Date.now() - started).toBeGreaterThanOrEqual(1500);

    const { code, signal } = await exit;
    expect({ code, signal }).toEqual({ code: 0, signal: null });
    expect(output).toMatch(/"msg":"stopping: finishing requests in flight"/);
    expect(output).toMatch(/"msg":"stopped"/);
  }, 60_000);
});
