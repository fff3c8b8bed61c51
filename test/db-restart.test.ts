/**
 * PostgreSQL stopped and started again under a running app: while it is away the health route
 * and every request answer 503 with Retry-After (never a 500 or a dropped connection), and once
 * it is back the same app, without a restart, serves again. Runs on a scratch cluster of its own
 * so it can stop it.
 */
import { rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { fileURLToPath } from 'node:url';
import { setTimeout as sleep } from 'node:timers/promises';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { clusterHome, createDatabase as createPgDatabase, databaseUrl, ensureCluster, stopCluster } from '../scripts/lib/pg.mjs';
import { createDatabase, type Database } from '../server/db/client';
import { runMigrations } from '../server/db/migrate';
import { seedDemo } from '../server/db/seed/seed';
import { testApp, type TestContext } from './support/app';
import { signInStaff, type Signed } from './support/auth';

const ROOT = fileURLToPath(new URL('..', import.meta.url));
const home = clusterHome(ROOT, `fault-pg-${process.pid}`);
let port = 0;
let database: Database;
let ctx: TestContext;
let office: Signed;

/** A port nothing listens on just now. */
function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = createServer();
    s.once('error', reject);
    s.listen(0, '127.0.0.1', () => {
      const p = (s.address() as { port: number }).port;
      s.close(() => resolve(p));
    });
  });
}

beforeAll(async () => {
  port = await freePort();
  const { bin } = await ensureCluster({ home, port, durable: false });
  createPgDatabase(bin, port, 'seasonwell_fault');
  const url = databaseUrl(port, 'seasonwell_fault');
  await runMigrations(url);
  database = createDatabase(url, 4);
  await seedDemo(database.db);
  ctx = testApp({ database, env: { DATABASE_URL: url } });
  office = await signInStaff(ctx, 'teo.marchetti@bluestem-comfort.test');
}, 180_000);

afterAll(async () => {
  await database?.close().catch(() => undefined);
  stopCluster({ home });
  rmSync(home, { recursive: true, force: true });
});

const customers = () => office.agent.get('/api/customers');

describe('PostgreSQL restarted while requests run', () => {
  it('answers 503 with Retry-After while it is away, and recovers by itself when it is back', async () => {
    expect((await customers()).status).toBe(200);

    // Requests in flight as the server goes down: each gets an answer, 200 or 503.
    const inFlight = Array.from({ length: 12 }, (_, i) => (i % 2 ? customers() : request(ctx.app).get('/api/health/slow?ms=300')));
    stopCluster({ home });
    for (const res of await Promise.all(inFlight)) expect([200, 503], `answered ${res.status} ${res.text.slice(0, 200)}`).toContain(res.status);

    const health = await request(ctx.app).get('/api/health');
    expect(health.status).toBe(503);
    expect(health.headers['retry-after']).toMatch(/^\d+$/);
    expect(health.body).toMatchObject({ status: 'unavailable', database: 'down' });
    const down = await customers();
    expect(down.status, down.text).toBe(503);
    expect(down.headers['retry-after']).toMatch(/^\d+$/);
    expect(down.body).toEqual({ error: { code: 'unavailable', message: expect.any(String) } });
    const write = await office.agent.post('/api/customers').set('X-XSRF-TOKEN', office.csrf).send({ name: 'While away', email: 'away@example.test' });
    expect(write.status, write.text).toBe(503);

    await ensureCluster({ home, port, durable: false });
    // The same app and pool: the first requests may meet connections the restart closed.
    let back = await customers();
    for (let i = 0; i < 20 && back.status !== 200; i++) {
      expect(back.status).toBe(503);
      await sleep(250);
      back = await customers();
    }
    expect(back.status).toBe(200);
    expect((await request(ctx.app).get('/api/health')).status).toBe(200);
  }, 120_000);
});
