import type { AppDeps } from '../deps';
import { RENEWAL_DAILY_JOB, RENEWAL_NOTICE_JOB, runRenewals, sendRenewalNotice } from './renewal-engine';

/** The daily renewal pass (06:15 company time) and office-requested notices. */
export function registerRenewalJobs(deps: Pick<AppDeps, 'config' | 'database' | 'clock' | 'logger' | 'mailer' | 'jobs' | 'stripe'>): void {
  const jobs = deps.jobs;
  jobs.register(
    RENEWAL_DAILY_JOB,
    async () => {
      const report = await runRenewals(deps);
      deps.logger.info({ report }, 'renewal pass finished');
    },
    { cron: '15 6 * * *', queue: { name: RENEWAL_DAILY_JOB, retryLimit: 3, retryDelay: 600, policy: 'singleton' } },
  );
  jobs.register<{ agreementId: string; sentById?: string }>(RENEWAL_NOTICE_JOB, async ({ agreementId, sentById }) => {
    await sendRenewalNotice(deps, agreementId, { sentById });
  });
}
