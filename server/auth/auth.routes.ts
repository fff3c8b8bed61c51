import { Router, type Request } from 'express';
import * as z from 'zod';
import type { AppDeps } from '../deps';
import { AppError, notFound, parse } from '../http/errors';
import {
  forgotPasswordSchema,
  householdInviteSchema,
  LINK_SENT_MESSAGE,
  linkConfirmSchema,
  linkRequestSchema,
  RESET_SENT_MESSAGE,
  setPasswordSchema,
  staffInviteSchema,
  staffSignInSchema,
  staffUpdateSchema,
} from '../../shared/schemas/auth';
import type { SessionUser } from '../../shared/schemas/session';
import { currentUser, requireRole, requireUser } from './access';
import { inviteHousehold, inviteStaff, listStaff, requestPasswordReset, setPasswordFromLink, signOutEverywhereFor, updateStaff } from './accounts.service';
import { confirmSignInLink, requestSignInLink } from './auth.service';
import { sendHouseholdInvitation, sendPasswordReset, sendSignInLink, sendStaffInvitation } from './auth.mail';
import { authLimits } from './rate-limit';
import { authenticatorFor, endAllSessions, endSession, startSession } from './session';
import { STAFF_STRATEGY } from './staff-strategy';
import { recordAudit } from '../audit/audit.service';

const ipOf = (req: Request) => req.ip ?? 'unknown';

function idParam(value: unknown): string {
  const r = z.uuid().safeParse(value);
  if (!r.success) throw notFound();
  return r.data;
}

function passwordSignIn(deps: AppDeps, req: Request): Promise<SessionUser> {
  const auth = authenticatorFor(deps);
  return new Promise((resolve, reject) => {
    auth.authenticate(STAFF_STRATEGY, { session: false }, (err: unknown, user: SessionUser | false) => {
      if (err) return reject(err);
      if (!user) return reject(new AppError(401, 'bad_credentials', 'That e-mail address and password do not match an account.'));
      resolve(user);
    })(req, {} as never, reject);
  });
}

// Sign-in and sign-out for homeowners (e-mailed link) and staff (password), invitations and staff access.
export function authRoutes(deps: AppDeps): Router {
  const router = Router({ caseSensitive: true, strict: true });
  const limits = authLimits(deps);

  router.post('/staff/sign-in', limits.passwordByIp, async (req, res) => {
    req.body = parse(staffSignInSchema, req.body);
    const user = await passwordSignIn(deps, req);
    await startSession(req, res, deps, user);
    res.json({ user });
  });

  router.post('/link', limits.linkByIp, limits.linkByEmail, async (req, res) => {
    const { email } = parse(linkRequestSchema, req.body);
    const { delivery } = await requestSignInLink(deps, email, ipOf(req));
    // Queued, never sent in the request: known and unknown addresses answer alike.
    await sendSignInLink(deps, delivery);
    res.status(202).json({ message: LINK_SENT_MESSAGE });
  });

  router.post('/link/confirm', async (req, res) => {
    const { token } = parse(linkConfirmSchema, req.body);
    const user = await confirmSignInLink(deps, token, ipOf(req));
    await startSession(req, res, deps, user);
    res.json({ user });
  });

  router.post('/password/forgot', limits.resetByIp, limits.resetByEmail, async (req, res) => {
    const { email } = parse(forgotPasswordSchema, req.body);
    const delivery = await requestPasswordReset(deps, email, ipOf(req));
    await sendPasswordReset(deps, delivery);
    res.status(202).json({ message: RESET_SENT_MESSAGE });
  });

  router.post('/password/set', async (req, res) => {
    const { token, password } = parse(setPasswordSchema, req.body);
    const user = await setPasswordFromLink(deps, token, password, ipOf(req));
    await startSession(req, res, deps, user);
    res.json({ user });
  });

  router.post('/sign-out', requireUser, async (req, res) => {
    const user = currentUser(req);
    await endSession(req, res, deps);
    await recordAudit(deps.database.db, { action: 'sign_out', actorUserId: user.id, subject: user.email, ip: ipOf(req), at: deps.clock() });
    res.json({ user: null });
  });

  router.post('/sign-out-everywhere', requireUser, async (req, res) => {
    const user = currentUser(req);
    const ended = await endAllSessions(deps, user.id);
    await endSession(req, res, deps);
    await recordAudit(deps.database.db, {
      action: 'sign_out_everywhere',
      actorUserId: user.id,
      subject: user.email,
      ip: ipOf(req),
      at: deps.clock(),
      details: { sessions: ended },
    });
    res.json({ user: null, sessionsEnded: ended });
  });

  router.post('/household-invitations', requireRole('office', 'owner'), async (req, res) => {
    const input = parse(householdInviteSchema, req.body);
    const invite = await inviteHousehold(deps, currentUser(req), input.customerId, input, ipOf(req));
    await sendHouseholdInvitation(deps, invite);
    res.status(201).json({ customerId: invite.customerId, userId: invite.userId, email: invite.email });
  });

  router.get('/staff', requireRole('owner'), async (_req, res) => {
    res.json({ items: await listStaff(deps) });
  });

  router.post('/staff/invite', requireRole('owner'), async (req, res) => {
    const input = parse(staffInviteSchema, req.body);
    const invite = await inviteStaff(deps, currentUser(req), input, ipOf(req));
    await sendStaffInvitation(deps, invite);
    res.status(201).json({ userId: invite.userId, email: invite.email });
  });

  router.patch('/staff/:id', requireRole('owner'), async (req, res) => {
    const id = idParam(req.params.id);
    const change = parse(staffUpdateSchema, req.body);
    res.json(await updateStaff(deps, currentUser(req), id, change, ipOf(req)));
  });

  router.post('/staff/:id/sign-out-everywhere', requireRole('owner'), async (req, res) => {
    const id = idParam(req.params.id);
    res.json({ sessionsEnded: await signOutEverywhereFor(deps, currentUser(req), id, ipOf(req)) });
  });

  return router;
}
