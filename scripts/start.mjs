// npm start: everything from a fresh clone to a running Seasonwell with demo data.
// Plain Node with built-ins only, because it runs before node_modules exists.
import { join } from 'node:path';
import { clusterHome, databaseUrl, ensureCluster, stopCluster } from './lib/pg.mjs';
import { ROOT, buildClient, buildServer, ensureDependencies, say, stopChild } from './lib/proc.mjs';
import { prepareDatabase, startStack } from './lib/stack.mjs';

const PORT = Number(process.env.PORT ?? 3100);
const PG_PORT = Number(process.env.SW_PG_PORT ?? 55432);
const SMTP_PORT = Number(process.env.SW_SMTP_PORT ?? 2526);
const MAILBOX_PORT = Number(process.env.SW_MAILBOX_PORT ?? 3101);
const STRIPE_PORT = Number(process.env.SW_STRIPE_PORT ?? 3102);
const PUBLIC_URL = process.env.PUBLIC_URL ?? `http://localhost:${PORT}`;

const children = [];
let pgHome = null;
let pgStarted = false;
let stopping = false;

async function shutdown(code) {
  if (stopping) return;
  stopping = true;
  say('stopping…');
  await Promise.all(children.map((c) => stopChild(c)));
  if (pgStarted && pgHome) stopCluster({ home: pgHome });
  process.exit(code);
}
process.on('SIGINT', () => void shutdown(0));
process.on('SIGTERM', () => void shutdown(0));

try {
  ensureDependencies();

  pgHome = clusterHome(ROOT, 'pg');
  const pg = await ensureCluster({ home: pgHome, port: PG_PORT, durable: true });
  pgStarted = pg.started;
  const DATABASE_URL = databaseUrl(PG_PORT, 'seasonwell');

  const env = {
    NODE_ENV: 'development',
    PORT: String(PORT),
    PUBLIC_URL,
    DATABASE_URL,
    SMTP_URL: `smtp://127.0.0.1:${SMTP_PORT}`,
    MAILBOX_URL: `http://127.0.0.1:${MAILBOX_PORT}`,
    STRIPE_API_URL: `http://127.0.0.1:${STRIPE_PORT}`,
    STORAGE_DIR: join(ROOT, '.data', 'uploads'),
  };
  await buildServer();
  await prepareDatabase(env);
  await buildClient();
  await startStack({ env, port: PORT, smtpPort: SMTP_PORT, mailboxPort: MAILBOX_PORT, stripePort: STRIPE_PORT, children });
  for (const child of children) {
    child.on('exit', (code) => {
      if (!stopping) {
        say(`a service stopped unexpectedly (exit ${code}); run npm start again to recover`);
        void shutdown(1);
      }
    });
  }

  say('');
  say(`Seasonwell is running at ${PUBLIC_URL}`);
  say(`Test mailbox (sign-in links and all mail): http://127.0.0.1:${MAILBOX_PORT}/`);
  say(`Test payment service: http://127.0.0.1:${STRIPE_PORT}/ (card 4242 4242 4242 4242 pays; 4000 0000 0000 0002 declines)`);
  say('');
  say('Demo sign-ins:');
  say('  Homeowner (e-mailed link, open the mailbox): dana.whitfield@example.test   (plan ends in 20 days)');
  say('  Homeowner (e-mailed link):                   sam.oduya@example.test');
  say('  Staff password for all staff below:          bluestem-demo-staff-2026');
  say('    Owner:       rosalind.okafor@bluestem-comfort.test');
  say('    Office:      teo.marchetti@bluestem-comfort.test');
  say('    Technician:  marcus.bellweather@bluestem-comfort.test   (has visits today)');
  say('    Technicians: priya.dunmore@bluestem-comfort.test, eli.castellan@bluestem-comfort.test');
  say('');
  say('Press Ctrl-C to stop.');
} catch (err) {
  process.stderr.write(`[seasonwell] ${err instanceof Error ? err.message : String(err)}\n`);
  await shutdown(1);
}
