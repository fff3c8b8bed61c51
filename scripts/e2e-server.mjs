// The app as the browser journeys see it: a fresh seeded database, the local fakes and the API
// serving the built client. Started by Playwright's webServer; `npm test` passes its database.
import { rmSync } from 'node:fs';
import { join } from 'node:path';
import { clusterHome, createDatabase, databaseUrl, dropDatabase, ensureCluster } from './lib/pg.mjs';
import { ROOT, buildServer, stopChild } from './lib/proc.mjs';
import { prepareDatabase, startStack } from './lib/stack.mjs';

const PORT = Number(process.env.E2E_PORT ?? 3200);
const SMTP_PORT = Number(process.env.E2E_SMTP_PORT ?? 2527);
const MAILBOX_PORT = Number(process.env.E2E_MAILBOX_PORT ?? 3201);
const STRIPE_PORT = Number(process.env.E2E_STRIPE_PORT ?? 3202);

let url = process.env.E2E_DATABASE_URL;
let drop = null;
if (!url) {
  const port = Number(process.env.TEST_PG_PORT ?? 55433);
  const { bin } = await ensureCluster({ home: clusterHome(ROOT, 'test-pg'), port, durable: false });
  const name = `sw_e2e_${process.pid}`;
  createDatabase(bin, port, name);
  url = databaseUrl(port, name);
  drop = () => dropDatabase(bin, port, name);
}

const env = {
  NODE_ENV: 'test',
  LOG_LEVEL: 'warn',
  PORT: String(PORT),
  PUBLIC_URL: `http://localhost:${PORT}`,
  DATABASE_URL: url,
  SMTP_URL: `smtp://127.0.0.1:${SMTP_PORT}`,
  MAILBOX_URL: `http://127.0.0.1:${MAILBOX_PORT}`,
  STRIPE_API_URL: `http://127.0.0.1:${STRIPE_PORT}`,
  STORAGE_DIR: join(ROOT, '.data', `e2e-uploads-${process.pid}`),
  // Journeys read the assignment e-mail within seconds.
  VISIT_NOTICE_DELAY_SECONDS: '1',
  AUTH_LIMIT_SCALE: '20',
};
const children = [];
async function stop(code) {
  await Promise.all(children.map((c) => stopChild(c)));
  rmSync(env.STORAGE_DIR, { recursive: true, force: true });
  drop?.();
  process.exit(code);
}
process.on('SIGINT', () => void stop(0));
process.on('SIGTERM', () => void stop(0));

try {
  // Journeys run the compiled server, as production does.
  await buildServer();
  await prepareDatabase(env);
  await startStack({ env, port: PORT, smtpPort: SMTP_PORT, mailboxPort: MAILBOX_PORT, stripePort: STRIPE_PORT, children });
  console.log(`[e2e] app ready on ${env.PUBLIC_URL}`);
} catch (err) {
  console.error(`[e2e] ${err instanceof Error ? err.message : err}`);
  await stop(1);
}
