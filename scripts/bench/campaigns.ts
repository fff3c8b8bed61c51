// Campaign sending and the audience statement. Sends a campaign of CAMPAIGN_N recipients through
// the real SMTP catcher from a worker in its own process (its peak memory is the child's max RSS),
// beside a bare nodemailer-to-catcher loop at the same concurrency in the same run, as a ratio;
// then times the audience count and its first keyset page over HOUSEHOLDS households.
import { spawn } from 'node:child_process';
import { performance } from 'node:perf_hooks';
import { fileURLToPath } from 'node:url';
import { DateTime } from 'luxon';
import nodemailer from 'nodemailer';
import { loadConfig } from '../../server/config';
import { createDatabase } from '../../server/db/client';
import { seedDemo } from '../../server/db/seed/seed';
import { MailStore, startSmtpCatcher } from '../../server/fakes/mail';
import { audienceCount, audiencePage } from '../../server/campaigns/audience';
import { DEFAULT_TUNING } from '../../server/campaigns/campaign-send';
import { furnishHouseholds, generateHouseholds } from './lib/data';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const URL_ = process.env.BENCH_DATABASE_URL!;
const CAMPAIGN_N = Number(process.env.BENCH_CAMPAIGN_N ?? 10_000);
const BARE_N = Number(process.env.BENCH_BARE_N ?? 2_000);
const HOUSEHOLDS = Number(process.env.BENCH_HOUSEHOLDS ?? 100_000);
const NOW = DateTime.now().setZone('America/Chicago');

const database = createDatabase(URL_, 4);
const { pool } = database;
await seedDemo(database.db, NOW.minus({ days: 60 }));
const demo = Number((await pool.query(`select count(*) from customers`)).rows[0].count);
await generateHouseholds(pool, Math.max(0, HOUSEHOLDS - demo));
await furnishHouseholds(pool, NOW.toISODate()!);
// Filters on a share of the furnaces, of each depth, so the filter audience has work to do.
await pool.query(
  `update equipment set filter_size = (array['16x25x1','20x25x1','20x25x2','20x25x4'])[1 + abs(hashtext(id::text)) % 4] where kind = 'gas_furnace' and abs(hashtext(id::text)) % 3 > 0`,
);
await pool.query(`analyze equipment`);
const households = Number((await pool.query(`select count(*) from customers`)).rows[0].count);

const store = new MailStore({ capacity: CAMPAIGN_N + BARE_N + 10 });
const smtp = await startSmtpCatcher({ port: 0, store });
const smtpUrl = `smtp://127.0.0.1:${smtp.port}`;

// ---- Bare loop: nodemailer straight to the catcher, same concurrency as the worker ----
const bare = nodemailer.createTransport({ url: smtpUrl, ignoreTLS: true, logger: false });
const body = 'A reminder of about the size of ours. '.repeat(40);
let next = 0;
const tb = performance.now();
await Promise.all(
  Array.from({ length: DEFAULT_TUNING.concurrency }, async () => {
    while (next < BARE_N) {
      const i = next++;
      await bare.sendMail({ from: 'Bench <office@bluestem-comfort.test>', to: `bare.${i}@example.test`, subject: 'Bare loop', text: body, html: `<p>${body}</p>` });
    }
  }),
);
const bareRate = BARE_N / ((performance.now() - tb) / 1000);
bare.close();

// ---- The campaign: outbox written set-based, sent by a worker process ----
const office = (await pool.query(`select id from users where role = 'office' limit 1`)).rows[0].id as string;
const camp = (
  await pool.query(`insert into reminder_campaigns (kind, created_by_id, audience_count, status, started_at) values ('filter', $1, $2, 'sending', now()) returning id`, [
    office,
    CAMPAIGN_N,
  ])
).rows[0].id as string;
await pool.query(
  `insert into reminder_sends (campaign_id, customer_id, property_id, kind, email, reason)
   select $1, c.id, (select p.id from properties p where p.customer_id = c.id limit 1), 'filter', c.email, 'due' from customers c where c.email is not null order by c.id limit $2`,
  [camp, CAMPAIGN_N],
);
const config = loadConfig({ NODE_ENV: 'test', DATABASE_URL: URL_ });
void config;
const before = store.list().length;
const tc = performance.now();
const child = spawn(process.execPath, ['--import', 'tsx', 'test/support/campaign-worker.ts'], {
  cwd: ROOT,
  env: { ...process.env, DATABASE_URL: URL_, SMTP_URL: smtpUrl, CAMPAIGN_ID: camp, REPORT_MEMORY: '1' },
  stdio: ['ignore', 'pipe', 'inherit'],
});
let out = '';
child.stdout.on('data', (d) => (out += String(d)));
const code = await new Promise<number | null>((r) => child.once('exit', r));
const campaignSeconds = (performance.now() - tc) / 1000;
const received = store.list().length - before;
const memory = JSON.parse(out.trim().split('\n').at(-1) || '{}') as { rss?: number; maxRss?: number };
const campaignRate = received / campaignSeconds;

// ---- The audience statement over the whole base ----
const ctx = { now: NOW.toJSDate(), timeZone: 'America/Chicago', seasons: { coolingStartMonth: 3, heatingStartMonth: 9 }, filter: {} };
const times: Record<string, { count: number; countMs: number; pageMs: number }> = {};
for (const kind of ['heating_tune_up', 'filter', 'coil_cleaning'] as const) {
  const t0 = performance.now();
  const count = await audienceCount(database.db, { ...ctx, kind });
  const t1 = performance.now();
  await audiencePage(database.db, { ...ctx, kind }, null, 200);
  times[kind] = { count, countMs: Math.round(t1 - t0), pageMs: Math.round(performance.now() - t1) };
}

console.log(`campaign: ${received} of ${CAMPAIGN_N} messages at the catcher in ${campaignSeconds.toFixed(1)} s = ${campaignRate.toFixed(0)} msg/s (worker exit ${code})`);
console.log(`bare nodemailer loop (${BARE_N} messages, ${DEFAULT_TUNING.concurrency} at once): ${bareRate.toFixed(0)} msg/s`);
console.log(`ratio campaign ÷ bare: ${(campaignRate / bareRate).toFixed(2)} (goal ≥ 0.7)`);
console.log(`worker peak RSS: ${memory.maxRss ? (memory.maxRss / 1024).toFixed(0) : '?'} MB, RSS at end ${memory.rss ? (memory.rss / 1048576).toFixed(0) : '?'} MB`);
for (const [k, t] of Object.entries(times)) console.log(`audience ${k} over ${households} households: ${t.count} due, count ${t.countMs} ms, first page of 200 ${t.pageMs} ms`);
await smtp.close();
await database.close();
