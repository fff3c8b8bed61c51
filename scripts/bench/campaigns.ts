// Campaign sending and the audience statement. Sends campaigns of each size in CAMPAIGN_SIZES
// through the real SMTP catcher from a worker in its own process (its peak memory is the child's
// max RSS, which should not grow with the audience: the outbox is read a batch at a time), beside a
// bare nodemailer-to-catcher loop at the same concurrency in the same run, as a ratio; then times
// the audience count and its first keyset page over HOUSEHOLDS households with a year of history.
import { spawn } from 'node:child_process';
import { performance } from 'node:perf_hooks';
import { fileURLToPath } from 'node:url';
import { DateTime } from 'luxon';
import nodemailer from 'nodemailer';
import { createDatabase } from '../../server/db/client';
import { seedDemo } from '../../server/db/seed/seed';
import { MailStore, startSmtpCatcher } from '../../server/fakes/mail';
import { audienceCount, audiencePage } from '../../server/campaigns/audience';
import { DEFAULT_TUNING } from '../../server/campaigns/campaign-send';
import { furnishHouseholds, generateHouseholds, reminderHistory } from './lib/data';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const URL_ = process.env.BENCH_DATABASE_URL!;
const CAMPAIGN_SIZES = (process.env.BENCH_CAMPAIGN_SIZES ?? '2000,10000').split(',').map(Number);
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
const history = await reminderHistory(pool, NOW.toISODate()!);
const households = Number((await pool.query(`select count(*) from customers`)).rows[0].count);

const store = new MailStore({ capacity: CAMPAIGN_SIZES.reduce((a, b) => a + b, 0) + BARE_N + 10 });
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

// ---- Campaigns: outbox written set-based, sent by a worker process, one per size ----
const office = (await pool.query(`select id from users where role = 'office' limit 1`)).rows[0].id as string;
const runs: { n: number; received: number; seconds: number; maxRssMb: number; code: number | null }[] = [];
let offset = 0;
for (const n of CAMPAIGN_SIZES) {
  const camp = (
    await pool.query(`insert into reminder_campaigns (kind, created_by_id, audience_count, status, started_at) values ('coil_cleaning', $1, $2, 'sending', now()) returning id`, [
      office,
      n,
    ])
  ).rows[0].id as string;
  await pool.query(
    `insert into reminder_sends (campaign_id, customer_id, property_id, kind, email, reason)
     select $1, c.id, (select p.id from properties p where p.customer_id = c.id limit 1), 'coil_cleaning', c.email, 'due' from customers c where c.email is not null order by c.id offset $3 limit $2`,
    [camp, n, offset],
  );
  offset += n;
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
  const seconds = (performance.now() - tc) / 1000;
  const memory = JSON.parse(out.trim().split('\n').at(-1) || '{}') as { maxRss?: number };
  // maxRSS is in kilobytes (getrusage(2)).
  runs.push({ n, received: store.list().length - before, seconds, maxRssMb: Math.round((memory.maxRss ?? 0) / 1024), code });
}
const largest = runs.at(-1)!;
const campaignRate = largest.received / largest.seconds;

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

for (const r of runs)
  console.log(
    `campaign of ${r.n}: ${r.received} messages at the catcher in ${r.seconds.toFixed(1)} s = ${(r.received / r.seconds).toFixed(0)} msg/s, worker peak RSS ${r.maxRssMb} MB (exit ${r.code})`,
  );
console.log(`bare nodemailer loop (${BARE_N} messages, ${DEFAULT_TUNING.concurrency} at once): ${bareRate.toFixed(0)} msg/s`);
console.log(`ratio campaign ÷ bare: ${(campaignRate / bareRate).toFixed(2)} (goal ≥ 0.7)`);
console.log(`worker peak RSS from ${runs[0]!.n} to ${largest.n} recipients: ${runs.map((r) => r.maxRssMb).join(' → ')} MB (${largest.n / runs[0]!.n}× the audience)`);
console.log(`history under the audience statement: ${history.visits} done visits, ${history.sends} earlier reminders sent`);
for (const [k, t] of Object.entries(times)) console.log(`audience ${k} over ${households} households: ${t.count} due, count ${t.countMs} ms, first page of 200 ${t.pageMs} ms`);
await smtp.close();
await database.close();
