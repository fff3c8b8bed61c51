import { and, asc, eq, inArray, isNull, sql } from 'drizzle-orm';
import type { AppDeps } from '../deps';
import { recordAudit } from '../audit/audit.service';
import { customers, signInLinks, technicians, users } from '../db/schema';
import { AppError, conflict, notFound } from '../http/errors';
import { STAFF_ROLES } from '../../shared/roles';
import { passwordProblem } from '../../shared/passwords/common';
import type { HouseholdInvite, StaffInvite, StaffMember, StaffUpdate } from '../../shared/schemas/auth';
import type { SessionUser } from '../../shared/schemas/session';
import { normaliseEmail } from './auth.service';
import { consumeLink, INVITATION_LINK_MINUTES, issueLink, RESET_LINK_MINUTES, signLinkToken, storeLinkForAddress } from './links';
import { hashPassword } from './passwords';
import { endAllSessions, forgetSessionUser } from './session';

// New technicians start on weekday days; the office adjusts them later.
const DEFAULT_WEEKLY_HOURS = {
  '1': { start: '08:00', end: '17:00' },
  '2': { start: '08:00', end: '17:00' },
  '3': { start: '08:00', end: '17:00' },
  '4': { start: '08:00', end: '17:00' },
  '5': { start: '08:00', end: '17:00' },
};

export interface Delivery {
  email: string;
  name: string;
  token: string;
}

/** Links a household to a new homeowner sign-in and returns the invitation link to send. */
export async function inviteHousehold(
  deps: Pick<AppDeps, 'config' | 'database' | 'clock'>,
  actor: SessionUser,
  customerId: string | undefined,
  input: HouseholdInvite,
  ip: string,
): Promise<Delivery & { customerId: string; userId: string }> {
  const db = deps.database.db;
  const now = deps.clock();
  if (!customerId && !input.email) throw new AppError(422, 'validation_failed', 'Enter a customer or an e-mail address.', { email: 'Enter a customer or an e-mail address.' });
  return db.transaction(async (tx) => {
    let customer: { id: string; name: string; email: string | null } | undefined;
    if (customerId) {
      [customer] = await tx
        .select({ id: customers.id, name: customers.name, email: customers.email })
        .from(customers)
        .where(and(eq(customers.id, customerId), isNull(customers.archivedAt)))
        .limit(1);
      if (!customer) throw notFound('That household');
    } else {
      const found = await tx
        .select({ id: customers.id, name: customers.name, email: customers.email })
        .from(customers)
        .where(and(sql`lower(${customers.email}) = ${input.email}`, isNull(customers.archivedAt)))
        .limit(2);
      if (found.length === 0) throw new AppError(404, 'not_found', 'No household has that e-mail address.', { email: 'No household has that e-mail address.' });
      if (found.length > 1)
        throw new AppError(409, 'ambiguous', 'Several households have that e-mail address; invite from the household record.', {
          email: 'Several households have that e-mail address.',
        });
      customer = found[0];
    }
    const email = input.email ?? (customer.email ? normaliseEmail(customer.email) : undefined);
    if (!email) throw new AppError(422, 'validation_failed', 'This household has no e-mail address; enter one.', { email: 'This household has no e-mail address; enter one.' });
    const [existing] = await tx.select().from(users).where(eq(users.email, email)).limit(1);
    let user = existing;
    if (existing && (existing.role !== 'homeowner' || existing.customerId !== customer.id)) {
      throw new AppError(409, 'email_taken', 'That e-mail address already signs in to another account.', { email: 'That e-mail address already signs in to another account.' });
    }
    if (!user) {
      [user] = await tx
        .insert(users)
        .values({ email, name: input.name ?? customer.name, role: 'homeowner', customerId: customer.id })
        .returning();
    }
    const token = await issueLink(tx, deps.config.JWT_SECRET, now, user, 'sign_in', INVITATION_LINK_MINUTES);
    await recordAudit(tx, { action: 'household_invited', actorUserId: actor.id, subject: email, ip, at: now, details: { customerId: customer.id, userId: user.id } });
    return { email, name: user.name, token, customerId: customer.id, userId: user.id };
  });
}

/** The owner invites a technician or office member; the link sets the first password. */
export async function inviteStaff(
  deps: Pick<AppDeps, 'config' | 'database' | 'clock'>,
  actor: SessionUser,
  input: StaffInvite,
  ip: string,
): Promise<Delivery & { userId: string }> {
  const now = deps.clock();
  return deps.database.db.transaction(async (tx) => {
    const [taken] = await tx.select({ id: users.id }).from(users).where(eq(users.email, input.email)).limit(1);
    if (taken) throw new AppError(409, 'email_taken', 'Someone already signs in with that e-mail address.', { email: 'Someone already signs in with that e-mail address.' });
    const [user] = await tx.insert(users).values({ email: input.email, name: input.name, role: input.role }).returning();
    if (input.role === 'technician') await tx.insert(technicians).values({ userId: user.id, weeklyHours: DEFAULT_WEEKLY_HOURS });
    const token = await issueLink(tx, deps.config.JWT_SECRET, now, user, 'set_password', INVITATION_LINK_MINUTES);
    await recordAudit(tx, { action: 'staff_invited', actorUserId: actor.id, subject: input.email, ip, at: now, details: { userId: user.id, role: input.role } });
    return { email: user.email, name: user.name, token, userId: user.id };
  });
}

/** Same work for known and unknown addresses; returns a delivery only for a staff account. */
export async function requestPasswordReset(deps: Pick<AppDeps, 'config' | 'database' | 'clock'>, rawEmail: string, ip: string): Promise<Delivery | null> {
  const db = deps.database.db;
  const email = normaliseEmail(rawEmail);
  const now = deps.clock();
  const link = signLinkToken(deps.config.JWT_SECRET, now, email, 'set_password', RESET_LINK_MINUTES);
  const stored = await storeLinkForAddress(db, link, email, 'set_password', sql`u.role in ('technician', 'office', 'owner')`, { action: 'password_reset_requested', ip, at: now });
  if (!stored) return null;
  return { email, name: '', token: link.token };
}

/** Uses an invitation or reset link to set a password; every other session of the user ends. */
export async function setPasswordFromLink(deps: Pick<AppDeps, 'config' | 'database' | 'clock'>, token: string, password: string, ip: string): Promise<SessionUser> {
  const problem = passwordProblem(password);
  if (problem) throw new AppError(422, 'weak_password', problem, { password: problem });
  const db = deps.database.db;
  const now = deps.clock();
  const passwordHash = await hashPassword(password);
  const used = await consumeLink(db, deps.config.JWT_SECRET, now, token, 'set_password');
  const [u] = await db
    .update(users)
    .set({ passwordHash, lastSignInAt: now })
    .where(and(eq(users.id, used.userId), eq(users.email, used.email), isNull(users.disabledAt), inArray(users.role, [...STAFF_ROLES])))
    .returning();
  if (!u) throw new AppError(400, 'link_invalid', 'This link is not valid. Please ask for a new one.', { token: 'This link is not valid.' });
  // Other unused links for this account stop working once a password is chosen.
  await db
    .update(signInLinks)
    .set({ usedAt: now })
    .where(and(eq(signInLinks.userId, u.id), eq(signInLinks.purpose, 'set_password'), isNull(signInLinks.usedAt)));
  await endAllSessions(deps, u.id);
  await recordAudit(db, { action: 'password_set', actorUserId: u.id, subject: u.email, ip, at: now });
  return { id: u.id, name: u.name, email: u.email, role: u.role, customerId: u.customerId };
}

export async function listStaff(deps: Pick<AppDeps, 'database'>): Promise<StaffMember[]> {
  const rows = await deps.database.db
    .select()
    .from(users)
    .where(inArray(users.role, [...STAFF_ROLES]))
    .orderBy(asc(users.name));
  return rows.map((u) => ({
    id: u.id,
    name: u.name,
    email: u.email,
    role: u.role as StaffMember['role'],
    disabled: !!u.disabledAt,
    lastSignInAt: u.lastSignInAt?.toISOString() ?? null,
    invitedPending: !u.passwordHash,
  }));
}

/** Role change and disabling for technician and office accounts; disabling ends their sessions. */
export async function updateStaff(deps: Pick<AppDeps, 'database' | 'clock'>, actor: SessionUser, userId: string, change: StaffUpdate, ip: string): Promise<StaffMember> {
  const now = deps.clock();
  const db = deps.database.db;
  await db.transaction(async (tx) => {
    const [u] = await tx.select().from(users).where(eq(users.id, userId)).for('update').limit(1);
    if (!u || u.role === 'homeowner') throw notFound('That staff member');
    if (u.role === 'owner') throw conflict('The owner account cannot be changed here.');
    if (change.role && change.role !== u.role) {
      await tx.update(users).set({ role: change.role }).where(eq(users.id, u.id));
      if (change.role === 'technician') {
        await tx
          .insert(technicians)
          .values({ userId: u.id, weeklyHours: DEFAULT_WEEKLY_HOURS })
          .onConflictDoUpdate({ target: technicians.userId, set: { active: true } });
      } else {
        await tx.update(technicians).set({ active: false }).where(eq(technicians.userId, u.id));
      }
      await recordAudit(tx, { action: 'role_changed', actorUserId: actor.id, subject: u.email, ip, at: now, details: { userId: u.id, from: u.role, to: change.role } });
    }
    if (change.disabled !== undefined && change.disabled !== !!u.disabledAt) {
      await tx
        .update(users)
        .set({ disabledAt: change.disabled ? now : null })
        .where(eq(users.id, u.id));
      await recordAudit(tx, { action: change.disabled ? 'user_disabled' : 'user_enabled', actorUserId: actor.id, subject: u.email, ip, at: now, details: { userId: u.id } });
    }
  });
  if (change.disabled) await endAllSessions(deps, userId);
  // Sessions keep the user's role; a changed role takes effect on the next request.
  else if (change.role) await forgetSessionUser(deps, userId);
  const member = (await listStaff(deps)).find((m) => m.id === userId);
  if (!member) throw notFound('That staff member');
  return member;
}

export async function signOutEverywhereFor(deps: Pick<AppDeps, 'database' | 'clock'>, actor: SessionUser, userId: string, ip: string): Promise<number> {
  const db = deps.database.db;
  const [u] = await db.select({ id: users.id, email: users.email, role: users.role }).from(users).where(eq(users.id, userId)).limit(1);
  if (!u || u.role === 'homeowner') throw notFound('That staff member');
  const ended = await endAllSessions(deps, u.id);
  await recordAudit(db, { action: 'sign_out_everywhere', actorUserId: actor.id, subject: u.email, ip, at: deps.clock(), details: { userId: u.id, sessions: ended } });
  return ended;
}
