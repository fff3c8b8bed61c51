import { pino } from 'pino';
import { createApp } from './app';
import { companyTimeZone } from './company/company';
import { loadConfig, type Config } from './config';
import { createDatabase } from './db/client';
import { runMigrations } from './db/migrate';
import { createMailer } from './integrations/mail';
import { createStripe } from './integrations/stripe';
import { createStorage } from './integrations/storage';
import { Jobs } from './jobs/queue';
import { registerJobs } from './jobs/register';
import type { AppDeps } from './deps';
import { answerClientErrors } from './http/client-errors';
import { closeHttpServer, logProcessFaults } from './runtime/shutdown';

let config: Config;
try {
  config = loadConfig();
} catch (err) {
  // A refusal names each variable to fix; a stack trace would only bury it.
  process.stderr.write(`[seasonwell] ${(err as Error).message}\n`);
  process.exit(1);
}
const logger = pino({ level: config.LOG_LEVEL, redact: ['password', 'token', '*.password', '*.token'] });
logProcessFaults(logger);

await runMigrations(config.DATABASE_URL);
const database = createDatabase(config.DATABASE_URL, config.DATABASE_POOL_MAX, logger);
const jobs = new Jobs(config.DATABASE_URL, logger);
const deps: AppDeps = {
  config,
  database,
  clock: () => new Date(),
  logger,
  // Outside production the test mailbox can say whether a message interrupted mid-send arrived.
  mailer: createMailer({ smtpUrl: config.SMTP_URL, from: config.MAIL_FROM, deliveryCheckUrl: config.production ? undefined : config.MAILBOX_URL }),
  jobs,
  stripe: createStripe({ secretKey: config.STRIPE_SECRET_KEY, apiUrl: config.STRIPE_API_URL }),
  storage: createStorage({
    dir: config.STORAGE_DIR,
    s3: config.STORAGE_S3_BUCKET
      ? {
          bucket: config.STORAGE_S3_BUCKET,
          endpoint: config.STORAGE_S3_ENDPOINT,
          region: config.STORAGE_S3_REGION,
          accessKeyId: config.STORAGE_S3_ACCESS_KEY_ID,
          secretAccessKey: config.STORAGE_S3_SECRET_ACCESS_KEY,
          forcePathStyle: Boolean(config.STORAGE_S3_ENDPOINT),
        }
      : undefined,
  }),
};
registerJobs(deps);
await jobs.start({ work: config.RUN_JOBS, timeZone: await companyTimeZone(database.db) });
const app = createApp(deps);

const server = app.listen(config.PORT, config.HOST, () => {
  logger.info({ url: config.publicUrl }, 'Seasonwell API listening');
});
answerClientErrors(server, logger);
server.on('error', (err) => {
  logger.fatal({ err }, 'could not start the HTTP server');
  process.exit(1);
});

// In this order: no new connections, requests in flight finish, the job workers finish their
// current jobs, and only then the pool closes, so nothing still running loses its database.
let stopping = false;
async function stop(signal: NodeJS.Signals) {
  if (stopping) return;
  stopping = true;
  logger.info({ signal }, 'stopping: finishing requests in flight');
  await closeHttpServer(server, logger);
  await jobs.stop().catch((err: unknown) => logger.error({ err }, 'job workers did not stop cleanly'));
  deps.mailer.close();
  await database.close().catch((err: unknown) => logger.error({ err }, 'closing the database pool failed'));
  logger.info('stopped');
  process.exit(0);
}
process.on('SIGINT', () => void stop('SIGINT'));
process.on('SIGTERM', () => void stop('SIGTERM'));
