import type { AppDeps } from '../deps';
import { processStoredEvent, STRIPE_EVENT_JOB } from '../webhooks/webhooks.service';
import { RECEIPT_JOB } from './receipts';
import { sendReceipt } from './receipts';

/** Receipts and processor events run as jobs, retried by the queue when they fail. */
export function registerBillingJobs(deps: Pick<AppDeps, 'config' | 'database' | 'clock' | 'logger' | 'mailer' | 'jobs' | 'stripe'>): void {
  const jobs = deps.jobs;
  jobs.register<{ paymentId: string }>(RECEIPT_JOB, async ({ paymentId }) => sendReceipt(deps, paymentId));
  jobs.register<{ eventId: string }>(STRIPE_EVENT_JOB, async ({ eventId }) => processStoredEvent(deps, eventId), {
    queue: { name: STRIPE_EVENT_JOB, retryLimit: 10, retryDelay: 5, retryBackoff: true },
  });
}
