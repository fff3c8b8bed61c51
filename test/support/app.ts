import { pino } from 'pino';
import { inject } from 'vitest';
import { createApp, type AppDeps } from '../../server/app';
import { loadConfig } from '../../server/config';
import { createDatabase, type Database } from '../../server/db/client';

export interface TestContext {
  app: ReturnType<typeof createApp>;
  deps: AppDeps;
  database: Database;
  close(): Promise<void>;
}

/** The real app on the run's real database. Pass overrides for config, clock or services. */
export function testApp(overrides: Partial<AppDeps> & { env?: Record<string, string> } = {}): TestContext {
  const url = inject('databaseUrl');
  const config = loadConfig({ NODE_ENV: 'test', DATABASE_URL: url, LOG_LEVEL: 'silent', CLIENT_DIST: 'dist/seasonwell/browser', ...overrides.env });
  const database = overrides.database ?? createDatabase(url, 5);
  const deps: AppDeps = {
    config,
    database,
    clock: () => new Date(),
    logger: pino({ level: 'silent' }),
    services: {},
    ...overrides,
  };
  const app = createApp(deps);
  return { app, deps, database, close: () => database.close() };
}
