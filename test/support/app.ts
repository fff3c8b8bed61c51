import { randomBytes } from 'node:crypto';
import { pino } from 'pino';
import { inject } from 'vitest';
import { createApp } from '../../server/app';
import { loadConfig } from '../../server/config';
import { createDatabase, type Database } from '../../server/db/client';
import type { AppDeps } from '../../server/deps';
import { registerJobs } from '../../server/jobs/register';
import { localFakes } from './fakes';

export interface TestContext {
  app: ReturnType<typeof createApp>;
  deps: AppDeps;
  database: Database;
  close(): Promise<void>;
}

/**
 * The real app on the run's real database, with the local fakes for every integration the test
 * does not pass itself (config, clock, mailer, jobs, stripe, storage can all be overridden).
 */
export function testApp(overrides: Partial<AppDeps> & { env?: Record<string, string> } = {}): TestContext {
  const url = inject('databaseUrl');
  const { env, ...given } = overrides;
  const config = loadConfig({ NODE_ENV: 'test', DATABASE_URL: url, LOG_LEVEL: 'silent', CLIENT_DIST: 'dist/seasonwell/browser', ...env });
  const database = given.database ?? createDatabase(url, 5);
  const deps: AppDeps = {
    config,
    database,
    clock: () => new Date(),
    logger: pino({ level: 'silent' }),
    ...localFakes(),
    ...given,
  };
  // Jobs run at once in the request that queues them, so their handlers must be registered.
  registerJobs(deps);
  const app = createApp(deps);
  return { app, deps, database, close: () => database.close() };
}

/** Settings production requires, each a fresh random value (none may be one from the repository). */
export function productionEnv(): Record<string, string> {
  const secret = () => randomBytes(24).toString('base64url');
  return {
    NODE_ENV: 'production',
    SESSION_SECRET: secret(),
    JWT_SECRET: secret(),
    STRIPE_SECRET_KEY: `sk_test_${secret()}`,
    STRIPE_WEBHOOK_SECRET: `whsec_${secret()}`,
    SMTP_URL: 'smtp://127.0.0.1:9',
  };
}
