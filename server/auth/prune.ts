import { and, isNull, lt, lte, or } from 'drizzle-orm';
import type { AppDeps } from '../deps';
import { authThrottle, rateLimitHits } from '../db/schema';
import { WINDOW_MS } from './throttle';

export const PRUNE_LIMITS_JOB = 'auth.prune-limits';

/**
 * Deletes rate-limit windows that have ended and sign-in throttle rows whose failures are past the
 * window and whose lock has run out. Neither changes a decision: an ended window starts again at 1,
 * and old failures are forgotten anyway. Without it every address ever seen stays a row.
 */
export async function pruneLimits(deps: Pick<AppDeps, 'database' | 'clock'>): Promise<{ rateLimits: number; throttles: number }> {
  const { db } = deps.database;
  const now = deps.clock();
  const forgottenBefore = new Date(now.getTime() - WINDOW_MS);
  const rateLimits = await db.delete(rateLimitHits).where(lte(rateLimitHits.resetAt, now)).returning({ key: rateLimitHits.key });
  const throttles = await db
    .delete(authThrottle)
    .where(and(or(isNull(authThrottle.lockedUntil), lte(authThrottle.lockedUntil, now)), or(isNull(authThrottle.lastFailureAt), lt(authThrottle.lastFailureAt, forgottenBefore))))
    .returning({ key: authThrottle.key });
  return { rateLimits: rateLimits.length, throttles: throttles.length };
}

export function registerAuthJobs(deps: AppDeps): void {
  // Daily, in the quiet of the night (company time zone).
  deps.jobs.register(
    PRUNE_LIMITS_JOB,
    async () => {
      const pruned = await pruneLimits(deps);
      deps.logger.info(pruned, 'pruned ended rate-limit windows and sign-in throttles');
    },
    { cron: '40 3 * * *' },
  );
}
