import type { Logger } from 'pino';
import type { Config } from './config';
import type { Database } from './db/client';
import type { Mailer } from './integrations/mail';
import type { Storage } from './integrations/storage';
import type { Stripe } from './integrations/stripe';
import type { JobQueue } from './jobs/queue';

/**
 * Everything the app needs from outside, passed in by main.ts (real services) or by tests (local
 * fakes). Imports no feature, so any feature may import it without closing a cycle. A service takes
 * only the part it uses, as its first parameter: `deps: Pick<AppDeps, 'database' | 'clock'>`.
 */
export interface AppDeps {
  config: Config;
  database: Database;
  clock: () => Date;
  logger: Logger;
  mailer: Mailer;
  jobs: JobQueue;
  stripe: Stripe;
  storage: Storage;
}
