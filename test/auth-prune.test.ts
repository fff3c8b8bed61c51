import { randomUUID } from 'node:crypto';
import { like } from 'drizzle-orm';
import { pino } from 'pino';
import { afterAll, describe, expect, it } from 'vitest';
import { inject } from 'vitest';
import { PRUNE_LIMITS_JOB, pruneLimits, registerAuthJobs } from '../server/auth/prune';
import { LOCK_MS } from '../server/auth/throttle';
import { authThrottle, rateLimitHits } from '../server/db/schema';
import { Jobs } from '../server/jobs/queue';
import { testApp } from './support/app';

const ctx = testApp();
const db = ctx.database.db;
// Each run's rows carry their own prefix; the real clock keeps every other test's live rows alive.
const tag = `prune-${randomUUID().slice(0, 8)}:`;
const minutes = (n: number) => new Date(Date.now() + n * 60_000);

afterAll(async () => {
  await db.delete(rateLimitHits).where(like(rateLimitHits.key, `${tag}%`));
  await db.delete(authThrottle).where(like(authThrottle.key, `${tag}%`));
  await ctx.close();
});

async function keysLeft(): Promise<string[]> {
  const a = await db
    .select({ key: rateLimitHits.key })
    .from(rateLimitHits)
    .where(like(rateLimitHits.key, `${tag}%`));
  const b = await db
    .select({ key: authThrottle.key })
    .from(authThrottle)
    .where(like(authThrottle.key, `${tag}%`));
  return [...a, ...b].map((r) => r.key.slice(tag.length)).sort();
}

async function seedRows(): Promise<void> {
  await db.insert(rateLimitHits).values([
    { key: `${tag}rate-ended`, hits: 7, resetAt: minutes(-1) },
    { key: `${tag}rate-live`, hits: 3, resetAt: minutes(10) },
  ]);
  await db.insert(authThrottle).values([
    // Failures past the 15-minute window, never locked: forgotten.
    { key: `${tag}throttle-old`, failures: 4, lastFailureAt: minutes(-16), lockedUntil: null },
    // Locked, and the lock ran out long ago: forgotten.
    { key: `${tag}throttle-unlocked`, failures: 10, lastFailureAt: minutes(-40), lockedUntil: minutes(-25) },
    // Recent failures still slow the account down: kept.
    { key: `${tag}throttle-recent`, failures: 6, lastFailureAt: minutes(-2), lockedUntil: null },
    // Still locked, though the failures are old: kept until the lock ends.
    { key: `${tag}throttle-locked`, failures: 50, lastFailureAt: minutes(-20), lockedUntil: minutes(LOCK_MS / 60_000 - 5) },
  ]);
}

describe('pruning the rate-limit and sign-in throttle tables', () => {
  it('deletes ended windows and forgotten throttles, and keeps every row that still decides something', async () => {
    await seedRows();
    const pruned = await pruneLimits(ctx.deps);
    expect(pruned.rateLimits).toBeGreaterThanOrEqual(1);
    expect(pruned.throttles).toBeGreaterThanOrEqual(2);
    expect(await keysLeft()).toEqual(['rate-live', 'throttle-locked', 'throttle-recent']);
  });

  it('runs as the daily job', async () => {
    await db.delete(rateLimitHits).where(like(rateLimitHits.key, `${tag}%`));
    await db.delete(authThrottle).where(like(authThrottle.key, `${tag}%`));
    await seedRows();
    const jobs = new Jobs(inject('databaseUrl'), pino({ level: 'silent' }));
    const registered: { name: string; cron?: string }[] = [];
    const spy = {
      register: (name: string, handler: unknown, opts: { cron?: string } = {}) => {
        registered.push({ name, cron: opts.cron });
        jobs.register(name, handler as never, opts);
      },
    } as unknown as Jobs;
    registerAuthJobs({ ...ctx.deps, jobs: spy });
    // Once a day (minute, hour, any day): pg-boss cron syntax.
    expect(registered).toEqual([{ name: PRUNE_LIMITS_JOB, cron: expect.stringMatching(/^\d+ \d+ \* \* \*$/) }]);
    await jobs.runNow(PRUNE_LIMITS_JOB, {});
    expect(await keysLeft()).toEqual(['rate-live', 'throttle-locked', 'throttle-recent']);
  });
});
