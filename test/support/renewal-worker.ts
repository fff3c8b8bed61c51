// One renewal worker as its own process, for the several-processes test: runs the renewal pass
// for the agreements named in RENEW_ONLY on RENEW_TODAY against DATABASE_URL and the card
// processor at STRIPE_API_URL, waits at a barrier file so both workers charge at once, and
// prints its report as one JSON line.
import { existsSync } from 'node:fs';
import { setTimeout as sleep } from 'node:timers/promises';
import { pino } from 'pino';
import { loadConfig } from '../../server/config';
import { createDatabase } from '../../server/db/client';
import type { AppDeps } from '../../server/deps';
import { createStripe } from '../../server/integrations/stripe';
import { registerJobs } from '../../server/jobs/register';
import { runRenewals } from '../../server/renewals/renewal-engine';
import { localFakes } from './fakes';

const env = process.env as Record<string, string>;
const config = loadConfig({ NODE_ENV: 'test', DATABASE_URL: env.DATABASE_URL, LOG_LEVEL: 'silent' });
const database = createDatabase(env.DATABASE_URL, 2);
const deps: AppDeps = {
  config,
  database,
  clock: () => new Date(),
  logger: pino({ level: 'silent' }),
  ...localFakes(),
  stripe: createStripe({ secretKey: 'sk_test_billing_harness', apiUrl: env.STRIPE_API_URL, maxNetworkRetries: 0 }),
};
registerJobs(deps);
await database.db.execute('select 1');
process.stdout.write('ready\n');
while (!existsSync(env.RENEW_GO)) await sleep(20);
// RENEW_KILL=1: the process dies (SIGKILL) right after the processor took the charge, before
// anything is recorded: the worst moment for a crash.
const afterCharge = env.RENEW_KILL === '1' ? async () => void process.kill(process.pid, 'SIGKILL') : undefined;
const report = await runRenewals(deps, { only: env.RENEW_ONLY.split(','), today: env.RENEW_TODAY, afterCharge });
process.stdout.write(`${JSON.stringify(report)}\n`);
await database.close();
