// A campaign worker in its own process, so a test can kill it mid-send (SIGKILL) and start another.
import { pino } from 'pino';
import { loadConfig } from '../../server/config';
import { createDatabase } from '../../server/db/client';
import { createMailer } from '../../server/integrations/mail';
import { sendCampaign } from '../../server/campaigns/campaigns.service';
import { DEFAULT_TUNING } from '../../server/campaigns/campaign-send';

const env = process.env;
const config = loadConfig({ NODE_ENV: 'test', DATABASE_URL: env.DATABASE_URL!, LOG_LEVEL: 'silent', PUBLIC_URL: 'https://portal.bluestem-comfort.test' });
const database = createDatabase(env.DATABASE_URL!, 6);
const mailer = createMailer({ smtpUrl: env.SMTP_URL!, from: 'Mailer <office@bluestem-comfort.test>' });
const deps = { config, database, mailer, clock: () => new Date(), logger: pino({ level: 'silent' }) };
await sendCampaign(deps, env.CAMPAIGN_ID!, { ...DEFAULT_TUNING, staleClaimMs: Number(env.STALE_MS ?? DEFAULT_TUNING.staleClaimMs), retryBaseMs: 50 });
if (env.REPORT_MEMORY) process.stdout.write(JSON.stringify({ rss: process.memoryUsage().rss, maxRss: process.resourceUsage().maxRSS }) + '\n');
await database.close();
mailer.close();
