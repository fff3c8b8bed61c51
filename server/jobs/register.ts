import type { AppDeps } from '../deps';
import { registerAuthJobs } from '../auth/prune';
import { registerMailJobs } from '../mail/mail.jobs';
import { registerBillingJobs } from '../billing/billing.jobs';
import { registerBookingJobs } from '../booking/day-before-notices';
import { registerNoticeJobs } from '../booking/assignment-notice';
import { registerRenewalJobs } from '../renewals/renewal.jobs';
import { registerCampaignJobs } from '../campaigns/campaigns.service';
import { registerQuoteJobs } from '../quotes/expiry';

/**
 * Every job queue, one line per feature: `registerRenewalJobs(deps)` and so on. Each feature's
 * register function calls deps.jobs.register(name, handler, { cron }).
 */
export function registerJobs(deps: AppDeps): void {
  registerBillingJobs(deps);
  registerRenewalJobs(deps);
  registerCampaignJobs(deps);
  registerQuoteJobs(deps);
  registerBookingJobs(deps);
  registerNoticeJobs(deps);
  registerAuthJobs(deps);
  registerMailJobs(deps);
}
