import type { AppDeps } from '../deps';
import { registerBillingJobs } from '../billing/billing.jobs';
import { registerBookingJobs } from '../booking/reminders';
import { registerRenewalJobs } from '../renewals/renewal.jobs';
import { registerReminderJobs } from '../reminders/reminders.service';

/**
 * Every job queue, one line per feature: `registerRenewalJobs(deps)` and so on. Each feature's
 * register function calls deps.jobs.register(name, handler, { cron }).
 */
export function registerJobs(deps: AppDeps): void {
  registerBillingJobs(deps);
  registerRenewalJobs(deps);
  registerReminderJobs(deps);
  registerBookingJobs(deps);
}
