// A campaign worker in its own process, so a test can kill it mid-send (SIGKILL), start another,
// or run two at once. CRASH_AFTER_ACCEPT=n kills the process the moment SMTP has accepted its n-th
// message, before the outbox row is marked sent: the crash window, on purpose.
import { pino } from 'pino';
import { loadConfig } from '../../server/config';
import { createDatabase } from '../../server/db/client';
import { createMailer, type Mailer } from '../../server/integrations/mail';
import { sendCampaign } from '../../server/campaigns/campaigns.service';
import { DEFAULT_TUNING } from '../../server/campaigns/campaign-send';

const env = process.env;
const num = (name: string, fallback: number) => (env[name] === undefined ? fallback : Number(env[name]));
const config = loadConfig({ NODE_ENV: 'test', DATABASE_URL: env.DATABASE_URL!, LOG_LEVEL: 'silent', PUBLIC_URL: 'https://portal.bluestem-comfort.test' });
const database = createDatabase(env.DATABASE_URL!, 6);
const smtp = createMailer({ smtpUrl: env.SMTP_URL!, from: 'Mailer <office@bluestem-comfort.test>', deliveryCheckUrl: env.MAILBOX_URL });
const crashAfter = num('CRASH_AFTER_ACCEPT', 0);
let accepted = 0;
const mailer: Mailer = {
  ...smtp,
  async send(message) {
    const r = await smtp.send(message);
    if (++accepted === crashAfter) process.kill(process.pid, 'SIGKILL');
    return r;
  },
};
const deps = { config, database, mailer, clock: () => new Date(), logger: pino({ level: 'silent' }) };
const stale = num('STALE_MS', DEFAULT_TUNING.staleClaimMs);
await sendCampaign(deps, env.CAMPAIGN_ID!, {
  ...DEFAULT_TUNING,
  batch: num('BATCH', DEFAULT_TUNING.batch),
  concurrency: num('CONCURRENCY', DEFAULT_TUNING.concurrency),
  staleClaimMs: stale,
  inDoubtAfterMs: num('DOUBT_MS', stale),
  retryBaseMs: 50,
});
const memory = env.REPORT_MEMORY ? { rss: process.memoryUsage().rss, maxRss: process.resourceUsage().maxRSS } : {};
process.stdout.write(JSON.stringify({ accepted, ...memory }) + '\n');
await database.close();
smtp.close();
