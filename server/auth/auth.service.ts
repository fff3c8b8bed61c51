import { and, eq, inArray, sql } from 'drizzle-orm';
import type { AppDeps } from '../deps';
import { recordAudit } from '../audit/audit.service';
import { users } from '../db/schema';
import { AppError } from '../http/errors';
import { STAFF_ROLES } from '../../shared/roles';
import type { SessionUser } from '../../shared/schemas/session';
import { consumeLink, SIGN_IN_LINK_MINUTES, signLinkToken, storeLinkForAddress } from './links';
import { verifyPassword } from './passwords';
import { ACCOUNT_LOCK_AFTER, IP_LOCK_AFTER, accountKey, assertMayAttempt, clearFailures, ipKey, recordFailure } from './throttle';

export const normaliseEmail = (email: string) => email.trim().toLowerCase();

const badCredentials = () =>
  new AppError(401, 'bad_credentials', 'That e-mail address and password do not match an account.', { password: 'That e-mail address and password do not match an account.' });

const toSessionUser = (u: { id: string; name: string; email: string; role: SessionUser['role']; customerId: string | null }): SessionUser => ({
  id: u.id,
  name: u.name,
  email: u.email,
  role: u.role,
  customerId: u.customerId,
});

/** Checks a staff password with slow-down and lock-out; unknown addresses cost the same hash. */
export async function verifyStaffPassword(deps: Pick<AppDeps, 'database' | 'clock'>, rawEmail: string, password: string, ip: string): Promise<SessionUser> {
  const db = deps.database.db;
  const email = normaliseEmail(rawEmail);
  const now = deps.clock();
  const keys = { account: accountKey(email), ip: ipKey(ip) };
  await assertMayAttempt(db, keys, now);

  const [u] = await db
    .select()
    .from(users)
    .where(and(eq(users.email, email), inArray(users.role, [...STAFF_ROLES])))
    .limit(1);
  const ok = await verifyPassword(u?.passwordHash ?? null, password);
  if (!u || !ok) {
    const account = await recordFailure(db, keys.account, ACCOUNT_LOCK_AFTER, now);
    await recordFailure(db, keys.ip, IP_LOCK_AFTER, now);
    await recordAudit(db, {
      action: account.locked ? 'sign_in_locked' : 'sign_in_failed',
      subject: email,
      ip,
      at: now,
      actorUserId: u?.id ?? null,
      details: { failures: account.failures },
    });
    throw badCredentials();
  }
  if (u.disabledAt) {
    await recordAudit(db, { action: 'sign_in_failed', subject: email, ip, at: now, actorUserId: u.id, details: { reason: 'disabled' } });
    throw new AppError(403, 'account_disabled', 'This account has been turned off. Please ask the owner to turn it back on.');
  }
  await clearFailures(db, keys.account);
  await db.update(users).set({ lastSignInAt: now }).where(eq(users.id, u.id));
  await recordAudit(db, { action: 'sign_in', actorUserId: u.id, subject: email, ip, at: now, details: { method: 'password' } });
  return toSessionUser(u);
}

export interface LinkRequestResult {
  /** Set only when a link was stored; the caller sends it. Never shown to the requester. */
  delivery: { email: string; token: string } | null;
}

/**
 * Signs and stores a homeowner sign-in link. Known and unknown addresses do the same work
 * (sign, hash, one insert-select) and the caller answers both the same way.
 */
export async function requestSignInLink(deps: Pick<AppDeps, 'config' | 'database' | 'clock'>, rawEmail: string, ip: string): Promise<LinkRequestResult> {
  const db = deps.database.db;
  const email = normaliseEmail(rawEmail);
  const now = deps.clock();
  const link = signLinkToken(deps.config.JWT_SECRET, now, email, 'sign_in', SIGN_IN_LINK_MINUTES);
  const stored = await storeLinkForAddress(db, link, email, 'sign_in', sql`u.role = 'homeowner'`, { action: 'link_requested', ip, at: now });
  if (!stored) return { delivery: null };
  return { delivery: { email, token: link.token } };
}

/** Uses a sign-in link and returns the homeowner to sign in. */
export async function confirmSignInLink(deps: Pick<AppDeps, 'config' | 'database' | 'clock'>, token: string, ip: string): Promise<SessionUser> {
  const db = deps.database.db;
  const now = deps.clock();
  const used = await consumeLink(db, deps.config.JWT_SECRET, now, token, 'sign_in');
  const [u] = await db.select().from(users).where(eq(users.id, used.userId)).limit(1);
  if (!u || u.disabledAt || u.email !== used.email) {
    throw new AppError(400, 'link_invalid', 'This sign-in link is not valid. Please ask for a new one.', { token: 'This sign-in link is not valid.' });
  }
  await db.update(users).set({ lastSignInAt: now }).where(eq(users.id, u.id));
  await recordAudit(db, { action: 'sign_in', actorUserId: u.id, subject: u.email, ip, at: now, details: { method: 'link' } });
  return toSessionUser(u);
}
