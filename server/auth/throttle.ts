import { eq, inArray, sql } from 'drizzle-orm';
import type { Db } from '../db/client';
import { authThrottle } from '../db/schema';
import { AppError } from '../http/errors';

// Failed password attempts: per account a growing wait after 5, a 15-minute lock after 10;
// per address a lock after 50. Failures older than the window are forgotten.
export const ACCOUNT_SLOWDOWN_AFTER = 5;
export const ACCOUNT_LOCK_AFTER = 10;
export const IP_LOCK_AFTER = 50;
export const LOCK_MS = 15 * 60_000;
export const WINDOW_MS = 15 * 60_000;
const MAX_DELAY_MS = 60_000;

export const accountKey = (email: string) => `acct:${email}`;
export const ipKey = (ip: string) => `ip:${ip}`;

/** Wait required after `failures` failures: 1 s, 2 s, 4 s … up to a minute, from the 5th on. */
export function delayAfter(failures: number): number {
  if (failures < ACCOUNT_SLOWDOWN_AFTER) return 0;
  return Math.min(1000 * 2 ** (failures - ACCOUNT_SLOWDOWN_AFTER), MAX_DELAY_MS);
}

const tooMany = (ms: number) => {
  const seconds = Math.max(1, Math.ceil(ms / 1000));
  const wait = seconds >= 120 ? `${Math.ceil(seconds / 60)} minutes` : seconds === 1 ? '1 second' : `${seconds} seconds`;
  return new AppError(429, 'too_many_attempts', `Too many sign-in attempts. Please wait ${wait} and try again.`);
};

/** Throws 429 while the account or the address must wait. */
export async function assertMayAttempt(db: Db, keys: { account: string; ip: string }, now: Date): Promise<void> {
  const rows = await db
    .select()
    .from(authThrottle)
    .where(inArray(authThrottle.key, [keys.account, keys.ip]));
  for (const r of rows) {
    if (r.lockedUntil && r.lockedUntil > now) throw tooMany(r.lockedUntil.getTime() - now.getTime());
    if (r.key === keys.account && r.lastFailureAt && now.getTime() - r.lastFailureAt.getTime() < WINDOW_MS) {
      const wait = r.lastFailureAt.getTime() + delayAfter(r.failures) - now.getTime();
      if (wait > 0) throw tooMany(wait);
    }
  }
}

/** Counts one failure atomically and sets the lock when the limit is reached. */
export async function recordFailure(db: Db, key: string, lockAfter: number, now: Date): Promise<{ failures: number; locked: boolean }> {
  const windowStart = new Date(now.getTime() - WINDOW_MS);
  const lockUntil = new Date(now.getTime() + LOCK_MS);
  const fresh = sql`case when ${authThrottle.lastFailureAt} is null or ${authThrottle.lastFailureAt} < ${windowStart.toISOString()}::timestamptz then 1 else ${authThrottle.failures} + 1 end`;
  const [row] = await db
    .insert(authThrottle)
    .values({ key, failures: 1, lastFailureAt: now, lockedUntil: lockAfter <= 1 ? lockUntil : null })
    .onConflictDoUpdate({
      target: authThrottle.key,
      set: {
        failures: fresh,
        lastFailureAt: now,
        lockedUntil: sql`case when ${fresh} >= ${lockAfter} then ${lockUntil.toISOString()}::timestamptz else ${authThrottle.lockedUntil} end`,
      },
    })
    .returning({ failures: authThrottle.failures, lockedUntil: authThrottle.lockedUntil });
  return { failures: row.failures, locked: !!row.lockedUntil && row.lockedUntil > now };
}

export async function clearFailures(db: Db, key: string): Promise<void> {
  await db.delete(authThrottle).where(eq(authThrottle.key, key));
}
