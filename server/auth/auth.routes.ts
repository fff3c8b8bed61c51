import { Router, type Request } from 'express';
import type { AppDeps } from '../app';
import { AppError, parse } from '../http/errors';
import { LINK_SENT_MESSAGE, linkConfirmSchema, linkRequestSchema, staffSignInSchema } from '../../shared/schemas/auth';
import type { SessionUser } from '../../shared/schemas/session';
import { confirmSignInLink, requestSignInLink } from './auth.service';
import { sendSignInLink } from './auth.mail';
import { authenticatorFor, endSession, startSession } from './session';
import { STAFF_STRATEGY } from './staff-strategy';
import { requireUser } from './access';

const ipOf = (req: Request) => req.ip ?? 'unknown';

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

// Sign-in and sign-out for homeowners (e-mailed link) and staff (password).
export function authRoutes(deps: AppDeps): Router {
  const router = Router();

  router.post('/staff/sign-in', async (req, res) => {
    req.body = parse(staffSignInSchema, req.body);
    const user = await passwordSignIn(deps, req);
    await startSession(req, res, deps, user);
    res.json({ user });
  });

  router.post('/link', async (req, res) => {
    const { email } = parse(linkRequestSchema, req.body);
    const { delivery } = await requestSignInLink(deps, email, ipOf(req));
    // Sent after answering, so a known address does not answer slower than an unknown one.
    if (delivery) sendSignInLink(deps, delivery, req.log);
    res.status(202).json({ message: LINK_SENT_MESSAGE });
  });

  router.post('/link/confirm', async (req, res) => {
    const { token } = parse(linkConfirmSchema, req.body);
    const user = await confirmSignInLink(deps, token, ipOf(req));
    await startSession(req, res, deps, user);
    res.json({ user });
  });

  router.post('/sign-out', requireUser, async (req, res) => {
    await endSession(req, res, deps);
    res.json({ user: null });
  });

  return router;
}
