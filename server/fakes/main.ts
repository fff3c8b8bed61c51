// Local stand-ins for hosted services, for development and tests only: an SMTP catcher with its
// mailbox page, and a fake Stripe. Never started in production.
import { createMailboxApp, startSmtpCatcher } from './mail';
import { startFakeStripe } from './stripe';

const env = process.env;
if (env.NODE_ENV === 'production') throw new Error('The local fakes are not for production.');

const smtp = await startSmtpCatcher({ port: Number(env.SMTP_PORT ?? 2526) });
const mailbox = createMailboxApp(smtp.store);
const mailboxServer = mailbox.listen(Number(env.MAILBOX_PORT ?? 3101), '127.0.0.1');
const stripe = await startFakeStripe({
  port: Number(env.STRIPE_PORT ?? 3102),
  webhookUrl: env.STRIPE_WEBHOOK_URL,
  webhookSecret: env.STRIPE_WEBHOOK_SECRET ?? 'whsec_seasonwell_local',
});
console.log(`SMTP catcher on 127.0.0.1:${smtp.port}, mailbox on port ${env.MAILBOX_PORT ?? 3101}, fake Stripe at ${stripe.url}`);

async function stop() {
  mailboxServer.close();
  mailboxServer.closeAllConnections();
  await Promise.allSettled([smtp.close(), stripe.close()]);
  process.exit(0);
}
process.on('SIGINT', () => void stop());
process.on('SIGTERM', () => void stop());
