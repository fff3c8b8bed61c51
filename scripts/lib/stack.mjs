// The app's processes, shared by npm start and the browser tests: migrate and seed, then the local
// fakes (SMTP catcher, mailbox, fake Stripe) and the API. Built-ins only. Everything runs from the
// compiled server in dist/server (scripts/build-server.mjs), as production does: no TypeScript loader.
import { join } from 'node:path';
import { ROOT, run, startService, waitForHttp } from './proc.mjs';

// One process per service, so a killed service leaves nothing behind.
const node = process.execPath;
const compiled = (name) => ['--enable-source-maps', join(ROOT, 'dist', 'server', `${name}.js`)];

/** Runs pending migrations and seeds the demo scenario once. */
export async function prepareDatabase(env) {
  const full = { ...process.env, ...env };
  if ((await run(node, compiled('migrate'), { env: full })) !== 0) throw new Error('migrations failed');
  if ((await run(node, compiled('seed'), { env: full })) !== 0) throw new Error('seeding the demo failed');
}

/**
 * Starts the fakes and the API, waiting for each to answer. Pushes each child onto `children` as
 * soon as it starts, so a caller stopping half-way stops what did start.
 */
export async function startStack({ env, port, smtpPort, mailboxPort, stripePort, children }) {
  const fakes = startService('fakes', node, compiled('fakes'), {
    ...env,
    SMTP_PORT: String(smtpPort),
    MAILBOX_PORT: String(mailboxPort),
    STRIPE_PORT: String(stripePort),
    STRIPE_WEBHOOK_URL: `http://127.0.0.1:${port}/api/webhooks/stripe`,
  });
  children.push(fakes);
  await waitForHttp(`http://127.0.0.1:${mailboxPort}/api/messages`, { child: fakes });
  const api = startService('api', node, compiled('main'), env);
  children.push(api);
  await waitForHttp(`http://127.0.0.1:${port}/api/health`, { child: api });
}
