import type PgBoss from 'pg-boss';
import { deliverMail, MAIL_MAX_ATTEMPTS, MAIL_SEND_JOB, requeueStuckMail, type OutboxDeps } from './outbox';

export const MAIL_REQUEUE_JOB = 'mail.requeue-stuck';

/** Retry timing; tests shorten it. */
export interface MailRetry {
  retryDelay: number;
  retryBackoff: boolean;
}

/**
 * mail.send: one job per message, retried with doubling delays (30 s, 1, 2, 4, 8 min) while the
 * SMTP server is away. Polled every second, and woken at once when this process queues a mail.
 */
export function registerMailJobs(deps: OutboxDeps, retry: MailRetry = { retryDelay: 30, retryBackoff: true }): void {
  const { jobs } = deps;
  const queue: PgBoss.Queue = { name: MAIL_SEND_JOB, retryLimit: MAIL_MAX_ATTEMPTS - 1, ...retry, expireInSeconds: 120 };
  jobs.register<{ id: string }>(
    MAIL_SEND_JOB,
    async ({ id }) => {
      await deliverMail(deps, id);
    },
    { queue, work: { pollingIntervalSeconds: 1 } },
  );
  jobs.register(
    MAIL_REQUEUE_JOB,
    async () => {
      const n = await requeueStuckMail(deps);
      if (n) deps.logger.warn({ requeued: n }, 'queued stuck e-mails again');
    },
    { cron: '*/10 * * * *' },
  );
}
