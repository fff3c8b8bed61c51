import { createHmac, timingSafeEqual } from 'node:crypto';
import { and, eq, sql } from 'drizzle-orm';
import type { AppDeps } from '../deps';
import type { Db, Tx } from '../db/client';
import { customers, mailSuppressions } from '../db/schema';

/** Mail a household may opt out of. Transactional mail has no purpose here and is never suppressed. */
export const OPT_OUT_PURPOSES = ['reminders'] as const;
export type OptOutPurpose = (typeof OPT_OUT_PURPOSES)[number];
export const UNSUBSCRIBE_PATH = '/api/unsubscribe';

type SecretDeps = Pick<AppDeps, 'config'>;

/** The configured secret, or one derived from the session secret where none is set. */
function secretOf(deps: SecretDeps): string {
  return deps.config.UNSUBSCRIBE_SECRET ?? createHmac('sha256', deps.config.SESSION_SECRET).update('seasonwell-unsubscribe').digest('base64url');
}

const mac = (secret: string, body: string) => createHmac('sha256', secret).update(body).digest('base64url');

/** A signed token naming one household and one purpose: `<customerId>.<purpose>.<hmac>`. */
export function unsubscribeToken(deps: SecretDeps, customerId: string, purpose: OptOutPurpose): string {
  const body = `${customerId}.${purpose}`;
  return `${body}.${mac(secretOf(deps), body)}`;
}

export function readUnsubscribeToken(deps: SecretDeps, token: unknown): { customerId: string; purpose: OptOutPurpose } | null {
  if (typeof token !== 'string' || token.length > 200) return null;
  const [customerId, purpose, sig, extra] = token.split('.');
  if (!customerId || !purpose || !sig || extra !== undefined) return null;
  if (!/^[0-9a-f-]{36}$/i.test(customerId) || !(OPT_OUT_PURPOSES as readonly string[]).includes(purpose)) return null;
  const want = Buffer.from(mac(secretOf(deps), `${customerId}.${purpose}`));
  const got = Buffer.from(sig);
  if (want.length !== got.length || !timingSafeEqual(want, got)) return null;
  return { customerId, purpose: purpose as OptOutPurpose };
}

/** The List-Unsubscribe targets for one household's mail of one purpose (RFC 2369, RFC 8058). */
export function unsubscribeLinks(deps: Pick<AppDeps, 'config'>, customerId: string, purpose: OptOutPurpose, companyEmail: string): { url: string; mailto: string } {
  const url = new URL(UNSUBSCRIBE_PATH, deps.config.publicUrl);
  url.searchParams.set('token', unsubscribeToken(deps, customerId, purpose));
  return { url: url.toString(), mailto: `mailto:${companyEmail}?subject=${encodeURIComponent(`Unsubscribe ${purpose} ${customerId}`)}` };
}

/** Records the opt-out for the household's current address; a second one changes nothing. */
export async function suppress(db: Db | Tx, customerId: string, purpose: OptOutPurpose, source: string): Promise<boolean> {
  const [c] = await db.select({ email: customers.email }).from(customers).where(eq(customers.id, customerId)).limit(1);
  if (!c?.email) return false;
  await db.insert(mailSuppressions).values({ email: c.email, purpose, customerId, source }).onConflictDoNothing();
  return true;
}

export async function isSuppressed(db: Db | Tx, email: string, purpose: OptOutPurpose): Promise<boolean> {
  const [row] = await db
    .select({ id: mailSuppressions.id })
    .from(mailSuppressions)
    .where(and(sql`lower(${mailSuppressions.email}) = lower(${email})`, eq(mailSuppressions.purpose, purpose)))
    .limit(1);
  return row !== undefined;
}
