import connectPgSimple from 'connect-pg-simple';
import { eq, sql } from 'drizzle-orm';
import { Router, type Request, type Response } from 'express';
import session from 'express-session';
import passport from 'passport';
import type { AppDeps } from '../deps';
import type { Db } from '../db/client';
import { users } from '../db/schema';
import { AppError } from '../http/errors';
import type { SessionUser } from '../../shared/schemas/session';
import { csrfProtection, issueCsrf } from './csrf';
import { configureStaffStrategy } from './staff-strategy';

declare module 'express-session' {
  interface SessionData {
    csrfIssuedAt?: number;
    /** Epoch ms of sign-in, for the staff absolute timeout. */
    signedInAt?: number;
    /** Epoch ms of the last request, for the idle timeout on the injected clock. */
    lastSeenAt?: number;
    /** What requests need of the signed-in user, re-read from the users table every minute. */
    user?: SessionUser;
    /** Epoch ms (app clock) when `user` was last read. */
    userCheckedAt?: number;
  }
}

const MINUTE = 60_000;
export const STAFF_IDLE_MS = 30 * MINUTE;
export const HOMEOWNER_IDLE_MS = 14 * 24 * 60 * MINUTE;
export const STAFF_ABSOLUTE_MS = 12 * 60 * MINUTE;
// An anonymous session only carries the CSRF token for the sign-in forms.
const ANONYMOUS_IDLE_MS = 2 * 60 * MINUTE;
// Write lastSeenAt at most this often, so reads do not all rewrite the session row; the store's own
// touch is off, so a request that changes nothing costs the one read of the session row.
const TOUCH_EVERY_MS = MINUTE;
// The user kept in the session is re-read this often, so a user disabled or changed elsewhere
// (another process, the CLI) is refused or updated within a minute.
export const USER_RECHECK_MS = MINUTE;

export const SESSION_TABLE = 'session';
export const sessionCookieName = (production: boolean) => (production ? '__Host-sw.sid' : 'sw.sid');
export const idleFor = (role: SessionUser['role']) => (role === 'homeowner' ? HOMEOWNER_IDLE_MS : STAFF_IDLE_MS);

// Paths the client serves that carry a token in the URL; the token must not leak as a referrer.
const TOKEN_PAGES = ['/sign-in/confirm', '/set-password', '/api/auth/link/confirm', '/api/auth/password/set'];

async function loadSessionUser(db: Db, id: string): Promise<SessionUser | null> {
  const [u] = await db
    .select({ id: users.id, name: users.name, email: users.email, role: users.role, customerId: users.customerId, disabledAt: users.disabledAt })
    .from(users)
    .where(eq(users.id, id))
    .limit(1);
  if (!u || u.disabledAt) return null;
  return { id: u.id, name: u.name, email: u.email, role: u.role, customerId: u.customerId };
}

const authenticators = new WeakMap<AppDeps, passport.Authenticator>();

/** One passport instance per app (no global state), shared by the middleware and the routes. */
export function authenticatorFor(deps: AppDeps): passport.Authenticator {
  let auth = authenticators.get(deps);
  if (!auth) {
    auth = new passport.Authenticator();
    auth.serializeUser((user, done) => done(null, user.id));
    // Three arguments: passport then passes the request, whose session keeps the user.
    auth.deserializeUser((req: Request, id: string, done: (err: unknown, user?: SessionUser | false) => void) => {
      const s = req.session;
      const now = deps.clock().getTime();
      if (s.user?.id === id && s.userCheckedAt !== undefined && Math.abs(now - s.userCheckedAt) < USER_RECHECK_MS) return done(null, s.user);
      loadSessionUser(deps.database.db, id).then((u) => {
        if (u) {
          s.user = u;
          s.userCheckedAt = now;
        } else {
          delete s.user;
          delete s.userCheckedAt;
        }
        done(null, u ?? false);
      }, done);
    });
    configureStaffStrategy(auth, deps);
    authenticators.set(deps, auth);
  }
  return auth;
}

const regenerate = (req: Request) => new Promise<void>((resolve, reject) => req.session.regenerate((err) => (err ? reject(err) : resolve())));

/** Signs the user in on a fresh session id and starts the role's timeouts. */
export async function startSession(req: Request, res: Response, deps: AppDeps, user: SessionUser): Promise<string> {
  await new Promise<void>((resolve, reject) => req.login(user, (err) => (err ? reject(err) : resolve())));
  const now = deps.clock().getTime();
  req.session.user = user;
  req.session.userCheckedAt = now;
  req.session.signedInAt = now;
  req.session.lastSeenAt = now;
  req.session.cookie.maxAge = idleFor(user.role);
  return issueCsrf(req, res, deps.config);
}

/** Ends this session and hands out a new anonymous one with its own CSRF token. */
export async function endSession(req: Request, res: Response, deps: AppDeps): Promise<string> {
  await new Promise<void>((resolve, reject) => req.logout((err) => (err ? reject(err) : resolve())));
  req.session.cookie.maxAge = ANONYMOUS_IDLE_MS;
  return issueCsrf(req, res, deps.config);
}

/** Deletes every stored session of a user ("sign out everywhere", disabling). */
export async function endAllSessions(deps: Pick<AppDeps, 'database'>, userId: string): Promise<number> {
  const { db } = deps.database;
  const result = await db.execute(sql`delete from ${sql.identifier(SESSION_TABLE)} where (sess::jsonb) -> 'passport' ->> 'user' = ${userId}`);
  return result.rowCount ?? 0;
}

/** Drops the user kept in each of a user's sessions, so their next request reads the row again. */
export async function forgetSessionUser(deps: Pick<AppDeps, 'database'>, userId: string): Promise<void> {
  const { db } = deps.database;
  await db.execute(
    sql`update ${sql.identifier(SESSION_TABLE)} set sess = ((sess::jsonb) - 'user' - 'userCheckedAt')::json where (sess::jsonb) -> 'passport' ->> 'user' = ${userId}`,
  );
}

/**
 * Sessions in PostgreSQL, passport on top, role timeouts on the injected clock, then CSRF on
 * every state-changing request, whatever its path, except inside the raw-body webhook mounts.
 */
export function authMiddleware(deps: AppDeps, csrfExemptMounts: string[]): Router {
  const { config, database } = deps;
  const PgStore = connectPgSimple(session);
  const auth = authenticatorFor(deps);

  const router = Router({ caseSensitive: true, strict: true });
  router.use((req, res, next) => {
    if (TOKEN_PAGES.some((p) => req.path === p)) res.setHeader('Referrer-Policy', 'no-referrer');
    next();
  });
  router.use(
    session({
      name: sessionCookieName(config.production),
      secret: config.SESSION_SECRET,
      store: new PgStore({
        pool: database.pool,
        tableName: SESSION_TABLE,
        createTableIfMissing: true,
        disableTouch: true,
        pruneSessionInterval: config.NODE_ENV === 'test' ? false : 15 * 60,
      }),
      resave: false,
      saveUninitialized: false,
      // The cookie is sent again when the session is saved (lastSeenAt moves once a minute), not on
      // every answer: its expiry trails the server's own idle clock by at most a minute.
      rolling: false,
      proxy: true,
      cookie: { httpOnly: true, sameSite: 'lax', secure: config.production, path: '/', maxAge: ANONYMOUS_IDLE_MS },
    }),
  );
  router.use(auth.initialize());
  router.use(auth.session());
  router.use(async (req, res, next) => {
    if (!req.user) return next();
    const now = deps.clock().getTime();
    const s = req.session;
    const idle = idleFor(req.user.role);
    const absoluteOver = req.user.role !== 'homeowner' && (s.signedInAt ?? 0) + STAFF_ABSOLUTE_MS <= now;
    const idleOver = (s.lastSeenAt ?? 0) + idle <= now;
    if (absoluteOver || idleOver) {
      await regenerate(req);
      req.user = undefined;
      req.session.cookie.maxAge = ANONYMOUS_IDLE_MS;
      issueCsrf(req, res, config);
      res.locals.sessionEnded = true;
      return next();
    }
    if (now - (s.lastSeenAt ?? 0) >= TOUCH_EVERY_MS) s.lastSeenAt = now;
    s.cookie.maxAge = idle;
    next();
  });
  router.use((req, res, next) => {
    // A write from a session that just timed out cannot pass CSRF; say what really happened.
    if (res.locals.sessionEnded && req.method !== 'GET' && req.method !== 'HEAD') {
      throw new AppError(401, 'session_ended', 'Your session has ended. Please sign in again.');
    }
    next();
  });
  router.use(csrfProtection(config, csrfExemptMounts));
  return router;
}
