/**
 * Several processes on one database, sharing no memory: two compiled API processes and two
 * renewal workers. A session made on one API process works on the other, a rate limit counts
 * requests to both, and a renewal run by both workers at once charges the card once.
 */
import { spawn } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { setTimeout as sleep } from 'node:timers/promises';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { inject } from 'vitest';
import { eq } from 'drizzle-orm';
import { ROOT, buildServer } from '../scripts/lib/proc.mjs';
import { termEnd, addDays } from '../shared/renewals';
import { localDate } from '../server/company/company';
import { agreements } from '../server/db/schema';
import { csrfFrom } from './support/auth';
import { startCompiledApi, type CompiledApi } from './support/compiled-api';
import { newHousehold, seedAgreement, startHarness, type Harness } from './billing-harness';

type Api = CompiledApi;
const apis: Api[] = [];
const storage = mkdtempSync(join(tmpdir(), 'sw-multi-'));
let dbUrl = '';

async function admin(sql: string): Promise<void> {
  const u = new URL(dbUrl);
  u.pathname = '/postgres';
  const c = new pg.Client({ connectionString: u.toString() });
  await c.connect();
  await c.query(sql).finally(() => c.end());
}

function run(file: string, env: Record<string, string>): Promise<void> {
  return new Promise((resolve, reject) => {
    const p = spawn(process.execPath, [file], { cwd: ROOT, env: { PATH: process.env.PATH, ...env }, stdio: ['ignore', 'pipe', 'pipe'] });
    let out = '';
    p.stdout!.on('data', (c) => (out += c));
    p.stderr!.on('data', (c) => (out += c));
    p.on('exit', (code) => (code === 0 ? resolve() : reject(new Error(`${file} exited ${code}:\n${out}`))));
  });
}

const startApi = () => startCompiledApi({ DATABASE_URL: dbUrl, STORAGE_DIR: storage, RUN_JOBS: 'false' }, 200);

/** A cookie jar of one: the session and CSRF cookies, sent to either process. */
class Browser {
  cookies = new Map<string, string>();
  csrf = '';
  async call(api: Api, method: string, path: string, body?: unknown, headers: Record<string, string> = {}) {
    const res = await fetch(`${api.url}${path}`, {
      method,
      headers: {
        ...headers,
        cookie: [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; '),
        ...(body ? { 'content-type': 'application/json' } : {}),
        ...(this.csrf ? { 'x-xsrf-token': this.csrf } : {}),
      },
      body: body ? JSON.stringify(body) : undefined,
    });
    for (const c of res.headers.getSetCookie()) {
      const [pair] = c.split(';');
      const at = pair!.indexOf('=');
      this.cookies.set(pair!.slice(0, at), pair!.slice(at + 1));
    }
    const token = csrfFrom({ headers: { 'set-cookie': res.headers.getSetCookie() } });
    if (token) this.csrf = token;
    return { status: res.status, body: (await res.json().catch(() => null)) as Record<string, any> | null }; // eslint-disable-line @typescript-eslint/no-explicit-any -- JSON bodies of many shapes, read field by field in the checks
  }
}

beforeAll(async () => {
  await buildServer();
  const u = new URL(inject('databaseUrl'));
  u.pathname = `${u.pathname}_multi`;
  dbUrl = u.toString();
  await admin(`create database "${u.pathname.slice(1)}"`);
  await run(join(ROOT, 'dist', 'server', 'migrate.js'), { DATABASE_URL: dbUrl });
  await run(join(ROOT, 'dist', 'server', 'seed.js'), { DATABASE_URL: dbUrl });
  // One after the other: the first start installs the job queue's schema in the new database.
  apis.push(await startApi());
  apis.push(await startApi());
}, 240_000);

afterAll(async () => {
  await Promise.all(apis.map((a) => new Promise((r) => (a.child.exitCode !== null ? r(null) : (a.child.once('exit', r), a.child.kill('SIGTERM'))))));
  rmSync(storage, { recursive: true, force: true });
  if (dbUrl) await admin(`drop database if exists "${new URL(dbUrl).pathname.slice(1)}" with (force)`);
});

describe('two API processes on one database', () => {
  it('a session made on one works on the other', async () => {
    const [a, b] = apis as [Api, Api];
    const me = new Browser();
    await me.call(a, 'GET', '/api/session');
    const signed = await me.call(a, 'POST', '/api/auth/staff/sign-in', { email: 'teo.marchetti@bluestem-comfort.test', password: 'bluestem-demo-staff-2026' });
    expect(signed.status).toBe(200);
    const there = await me.call(b, 'GET', '/api/session');
    expect(there.body?.user?.email).toBe('teo.marchetti@bluestem-comfort.test');
    expect((await me.call(b, 'GET', '/api/customers')).status).toBe(200);
    // Signing out on the second ends the session on the first too.
    expect((await me.call(b, 'POST', '/api/auth/sign-out', {})).status).toBeLessThan(300);
    expect((await me.call(a, 'GET', '/api/customers')).status).toBe(401);
  });

  it('a rate limit counts requests to both', async () => {
    const [a, b] = apis as [Api, Api];
    // Three reset links per address per 15 minutes (server/auth/rate-limit.ts), wherever asked.
    const me = new Browser();
    await me.call(a, 'GET', '/api/session');
    const statuses: number[] = [];
    for (const api of [a, b, a, b]) statuses.push((await me.call(api, 'POST', '/api/auth/password/forgot', { email: 'rosalind.okafor@bluestem-comfort.test' })).status);
    expect(
      statuses.slice(0, 3).every((s) => s < 300),
      `answers ${statuses}`,
    ).toBe(true);
    expect(statuses[3]).toBe(429);
  });
});

/** A renewal worker process (test/support/renewal-worker.ts): ready once connected, done with its output. */
function worker(env: Record<string, string>, script = 'renewal-worker.ts') {
  const p = spawn(join(ROOT, 'node_modules', '.bin', 'tsx'), [join(ROOT, 'test', 'support', script)], {
    cwd: ROOT,
    env: { PATH: process.env.PATH, ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let out = '';
  p.stdout!.on('data', (c) => (out += c));
  p.stderr!.on('data', (c) => (out += c));
  const ready = new Promise<void>((r) => p.stdout!.on('data', () => out.includes('ready') && r()));
  const exit = new Promise<{ code: number | null; signal: NodeJS.Signals | null; out: string }>((r) => p.on('exit', (code, signal) => r({ code, signal, out })));
  const done = () => exit.then(({ code, out: o }) => (code === 0 ? o : Promise.reject(new Error(`worker exited ${code}:\n${o}`))));
  return {
    ready,
    get done() {
      return done();
    },
    exit,
    stop: () => (p.exitCode === null && p.signalCode === null ? (p.kill('SIGTERM'), exit) : exit),
    output: () => out,
  };
}

describe('two renewal workers as separate processes', () => {
  let h: Harness;
  beforeAll(async () => {
    h = await startHarness({ webhooks: false });
  });
  afterAll(() => h?.close());

  it('charge a renewal once', async () => {
    const today = localDate(new Date(), 'America/Chicago');
    const hh = await newHousehold(h, 'two-workers');
    const endsOn = addDays(today, 0);
    const { agreement } = await seedAgreement(h, hh, { endsOn, status: 'renewal_due', card: 'pm_card_visa' });
    const go = join(storage, 'go');
    const env = { DATABASE_URL: inject('databaseUrl'), STRIPE_API_URL: h.fake.url, RENEW_ONLY: agreement.id, RENEW_TODAY: endsOn, RENEW_GO: go };
    const workers = [0, 1].map(() => worker(env));
    await Promise.all(workers.map((w) => w.ready));
    writeFileSync(go, '');
    const reports = (await Promise.all(workers.map((w) => w.done))).map((o) => JSON.parse(o.trim().split('\n').pop()!) as { charged: number; errors: unknown[] });
    expect(reports.flatMap((r) => r.errors)).toEqual([]);
    const intents = (await h.stripe.paymentIntents.list({ limit: 100 })).data.filter((p) => p.metadata['agreementId'] === agreement.id && p.status === 'succeeded');
    expect(intents).toHaveLength(1);
    const [row] = await h.ctx.database.db.select().from(agreements).where(eq(agreements.id, agreement.id));
    expect(row).toMatchObject({ status: 'active', endsOn: termEnd(endsOn) });
  }, 120_000);

  it('a worker killed (SIGKILL) after the charge is retried by another, which charges nobody twice', async () => {
    const today = localDate(new Date(), 'America/Chicago');
    const hh = await newHousehold(h, 'killed-worker');
    const endsOn = addDays(today, 0);
    const { agreement } = await seedAgreement(h, hh, { endsOn, status: 'renewal_due', card: 'pm_card_visa' });
    const go = join(storage, 'go-kill');
    writeFileSync(go, '');
    const env = { DATABASE_URL: inject('databaseUrl'), STRIPE_API_URL: h.fake.url, RENEW_ONLY: agreement.id, RENEW_TODAY: endsOn, RENEW_GO: go };
    const killed = await worker({ ...env, RENEW_KILL: '1' }).exit;
    // tsx runs the script in a child node and exits 128 + 9 when that child is killed.
    expect(killed.signal === 'SIGKILL' || killed.code === 137, killed.out).toBe(true);
    const succeeded = async () => (await h.stripe.paymentIntents.list({ limit: 100 })).data.filter((p) => p.metadata['agreementId'] === agreement.id && p.status === 'succeeded');
    expect(await succeeded()).toHaveLength(1);
    const [half] = await h.ctx.database.db.select().from(agreements).where(eq(agreements.id, agreement.id));
    expect(half!.status).toBe('renewal_due');
    await worker(env).done;
    expect(await succeeded()).toHaveLength(1);
    const [row] = await h.ctx.database.db.select().from(agreements).where(eq(agreements.id, agreement.id));
    expect(row).toMatchObject({ status: 'active', endsOn: termEnd(endsOn) });
  }, 120_000);

  it('a pg-boss renewal job whose worker is killed (SIGKILL) after the charge is retried by the next worker, with one charge', async () => {
    const today = localDate(new Date(), 'America/Chicago');
    const hh = await newHousehold(h, 'killed-job');
    const endsOn = addDays(today, 0);
    const { agreement } = await seedAgreement(h, hh, { endsOn, status: 'renewal_due', card: 'pm_card_visa' });
    const schema = `pgboss_kill_${Date.now().toString(36)}`;
    const env = { DATABASE_URL: inject('databaseUrl'), STRIPE_API_URL: h.fake.url, BOSS_SCHEMA: schema, RENEW_ONLY: agreement.id, RENEW_TODAY: endsOn };
    const killed = await worker({ ...env, RENEW_SEND: '1', RENEW_KILL: '1' }, 'renewal-job-worker.ts').exit;
    expect(killed.signal === 'SIGKILL' || killed.code === 137, killed.out).toBe(true);
    const succeeded = async () => (await h.stripe.paymentIntents.list({ limit: 100 })).data.filter((p) => p.metadata['agreementId'] === agreement.id && p.status === 'succeeded');
    expect(await succeeded()).toHaveLength(1);
    const c = new pg.Client({ connectionString: inject('databaseUrl') });
    await c.connect();
    try {
      const state = async () => (await c.query<{ state: string; retry_count: number }>(`select state, retry_count from "${schema}".job where name = 'renewal-one'`)).rows;
      expect(await state()).toEqual([{ state: 'active', retry_count: 0 }]);
      const t0 = Date.now();
      const next = worker(env, 'renewal-job-worker.ts');
      await next.ready;
      const deadline = Date.now() + 60_000;
      while (Date.now() < deadline && (await state())[0]?.state !== 'completed') await sleep(200);
      console.log(`killed job retried and completed ${Date.now() - t0} ms after the next worker started`);
      await next.stop();
      expect(await state(), next.output()).toEqual([{ state: 'completed', retry_count: 1 }]);
      expect(next.output()).toMatch(/"errors":\[\]/);
    } finally {
      await c.query(`drop schema if exists "${schema}" cascade`).finally(() => c.end());
    }
    expect(await succeeded()).toHaveLength(1);
    const [row] = await h.ctx.database.db.select().from(agreements).where(eq(agreements.id, agreement.id));
    expect(row).toMatchObject({ status: 'active', endsOn: termEnd(endsOn) });
  }, 120_000);
});
