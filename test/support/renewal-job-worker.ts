// A worker process running renewals as a pg-boss job, for the killed-mid-job test. Its queue
// (renewal-one, in the pg-boss schema BOSS_SCHEMA) expires an active job after 2 s and maintenance
// runs every second, so a job whose worker died is failed and retried within seconds. With
// RENEW_SEND=1 it queues the job for RENEW_ONLY on RENEW_TODAY; with RENEW_KILL=1 the process
// dies (SIGKILL) right after the processor took the charge, before anything is recorded.
import { pino } from 'pino';
import { loadConfig } from '../../server/config';
import { createDatabase } from '../../server/db/client';
import type { AppDeps } from '../../server/deps';
import { createStripe } from '../../server/integrations/stripe';
import { Jobs } from '../../server/jobs/queue';
import { runRenewals } from '../../server/renewals/renewal-engine';
import { localFakes } from './fakes';

const env = process.env as Record<string, string>;
const config = loadConfig({ NODE_ENV: 'test', DATABASE_URL: env.DATABASE_URL, LOG_LEVEL: 'silent' });
const database = createDatabase(env.DATABASE_URL, 2);
const logger = pino({ level: 'silent' });
const jobs = new Jobs(env.DATABASE_URL, logger, env.BOSS_SCHEMA, { maintenanceIntervalSeconds: 1 });
const deps: AppDeps = {
  config,
  database,
  clock: () => new Date(),
  logger,
  ...localFakes(),
  jobs,
  stripe: createStripe({ secretKey: 'sk_test_billing_harness', apiUrl: env.STRIPE_API_URL, maxNetworkRetries: 0 }),
};
const afterCharge = env.RENEW_KILL === '1' ? async () => void process.kill(process.pid, 'SIGKILL') : undefined;
jobs.register<{ only: string[]; today: string }>(
  'renewal-one',
  async ({ only, today }, job) => {
    const report = await runRenewals(deps, { only, today, afterCharge });
    process.stdout.write(`${JSON.stringify({ job: job.id, ...report })}\n`);
  },
  { queue: { name: 'renewal-one', expireInSeconds: 2, retryLimit: 3, retryDelay: 0 } },
);
await jobs.start({ work: true, timeZone: null });
if (env.RENEW_SEND === '1') await jobs.send('renewal-one', { only: env.RENEW_ONLY.split(','), today: env.RENEW_TODAY });
process.stdout.write('ready\n');
process.on('SIGTERM', () => {
  void jobs
    .stop()
    .then(() => database.close())
    .then(() => process.exit(0));
});
