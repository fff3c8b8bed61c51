import type { Express } from 'express';
import request from 'supertest';
import type { AppDeps } from '../../server/deps';
import { issueLink, SIGN_IN_LINK_MINUTES } from '../../server/auth/links';
import { CSRF_COOKIE } from '../../server/auth/csrf';
import { normaliseEmail } from '../../server/auth/auth.service';
import { users } from '../../server/db/schema';
import { eq } from 'drizzle-orm';
import { DEMO_STAFF_PASSWORD } from '../../server/db/seed/scenario';
import { startSmtpCatcher, type SmtpCatcher } from '../../server/fakes/mail';
import { createMailer, type Mailer } from '../../server/integrations/mail';

export type Agent = ReturnType<typeof request.agent>;
export interface Signed {
  /** Keeps the session cookie between requests. */
  agent: Agent;
  /** Send as the X-XSRF-TOKEN header on POST/PUT/PATCH/DELETE. */
  csrf: string;
}
type AppLike = Express | { app: Express; deps?: AppDeps };

export const CSRF_HEADER_NAME = 'X-XSRF-TOKEN';

const appOf = (a: AppLike): Express => ('app' in a && typeof a.app === 'function' ? a.app : (a as Express));
const depsOf = (a: AppLike): AppDeps | undefined => ('deps' in a ? a.deps : undefined);

/** The XSRF-TOKEN value from a response's Set-Cookie, if it set one. */
export function csrfFrom(res: { headers: Record<string, unknown> }): string | undefined {
  const raw = res.headers['set-cookie'];
  const list = Array.isArray(raw) ? (raw as string[]) : typeof raw === 'string' ? [raw] : [];
  for (const c of list) {
    const [pair] = c.split(';');
    const eq = pair.indexOf('=');
    if (pair.slice(0, eq) === CSRF_COOKIE) return decodeURIComponent(pair.slice(eq + 1));
  }
  return undefined;
}

/** No one signed in, with a CSRF token so writes reach the route (and get 401/403 there). */
export async function anonymous(app: AppLike): Promise<Signed> {
  const agent = request.agent(appOf(app));
  const res = await agent.get('/api/session').expect(200);
  const csrf = csrfFrom(res);
  if (!csrf) throw new Error('GET /api/session set no XSRF-TOKEN cookie');
  return { agent, csrf };
}

/** Signs a staff member in through POST /api/auth/staff/sign-in (demo password by default). */
export async function signInStaff(app: AppLike, email: string, password = DEMO_STAFF_PASSWORD): Promise<Signed> {
  const { agent, csrf } = await anonymous(app);
  const res = await agent.post('/api/auth/staff/sign-in').set(CSRF_HEADER_NAME, csrf).send({ email, password });
  if (res.status !== 200) throw new Error(`staff sign-in for ${email} answered ${res.status}: ${JSON.stringify(res.body)}`);
  const fresh = csrfFrom(res);
  if (!fresh) throw new Error('staff sign-in set no new XSRF-TOKEN cookie');
  return { agent, csrf: fresh };
}

/**
 * Signs a homeowner in the way the e-mailed link does: the link service issues a token for the
 * user, then the real confirm endpoint uses it. Needs the test context (deps) from testApp().
 */
export async function signInHomeowner(app: AppLike, email: string): Promise<Signed> {
  const deps = depsOf(app);
  if (!deps) throw new Error('signInHomeowner needs the testApp() context ({ app, deps }), not the bare Express app');
  const db = deps.database.db;
  const [user] = await db
    .select({ id: users.id, email: users.email, role: users.role })
    .from(users)
    .where(eq(users.email, normaliseEmail(email)))
    .limit(1);
  if (!user || user.role !== 'homeowner') throw new Error(`no homeowner with e-mail ${email}`);
  const token = await issueLink(db, deps.config.JWT_SECRET, deps.clock(), user, 'sign_in', SIGN_IN_LINK_MINUTES);
  const { agent, csrf } = await anonymous(app);
  const res = await agent.post('/api/auth/link/confirm').set(CSRF_HEADER_NAME, csrf).send({ token });
  if (res.status !== 200) throw new Error(`homeowner sign-in for ${email} answered ${res.status}: ${JSON.stringify(res.body)}`);
  const fresh = csrfFrom(res);
  if (!fresh) throw new Error('link sign-in set no new XSRF-TOKEN cookie');
  return { agent, csrf: fresh };
}

/** A local SMTP catcher and a mailer pointed at it, for tests that read the e-mailed links. */
export async function mailCatcher(): Promise<{ mailer: Mailer; catcher: SmtpCatcher; linkFor(to: string, after?: Date): Promise<string>; close(): Promise<void> }> {
  const catcher = await startSmtpCatcher({ port: 0, host: '127.0.0.1' });
  const mailer = createMailer({ smtpUrl: `smtp://127.0.0.1:${catcher.port}`, from: 'Seasonwell <hello@seasonwell.test>' });
  return {
    mailer,
    catcher,
    async linkFor(to, after) {
      const message = await catcher.store.waitForLatest({ to, after }, 5000);
      if (!message) throw new Error(`no e-mail arrived for ${to}`);
      const link = message.links.find((l) => l.includes('token='));
      if (!link) throw new Error(`the e-mail to ${to} has no link with a token`);
      return link;
    },
    async close() {
      mailer.close();
      await catcher.close();
    },
  };
}

/** The token carried by an e-mailed link. */
export const tokenOf = (link: string) => new URL(link).searchParams.get('token') ?? '';
