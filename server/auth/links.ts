import { createHash, randomBytes } from 'node:crypto';
import { and, eq, gt, isNull, sql } from 'drizzle-orm';
import jwt from 'jsonwebtoken';
import type { Db, Tx } from '../db/client';
import { auditEvents, signInLinks, users, type LinkPurpose } from '../db/schema';
import { AppError } from '../http/errors';

export const SIGN_IN_LINK_MINUTES = 10;
// An invitation may sit in an inbox for a weekend.
export const INVITATION_LINK_MINUTES = 3 * 24 * 60;
export const RESET_LINK_MINUTES = 30;

const ISSUER = 'seasonwell';

interface LinkClaims {
  sub: string;
  purpose: LinkPurpose;
  jti: string;
}

export const hashJti = (jti: string) => createHash('sha256').update(jti).digest('hex');

export interface SignedLink {
  token: string;
  jtiHash: string;
  expiresAt: Date;
}

/** Signs a token for an address. Pure work with no I/O, done for unknown addresses too. */
export function signLinkToken(secret: string, now: Date, email: string, purpose: LinkPurpose, minutes: number): SignedLink {
  const jti = randomBytes(24).toString('base64url');
  const iat = Math.floor(now.getTime() / 1000);
  const token = jwt.sign({ sub: email, purpose, iat }, secret, { algorithm: 'HS256', expiresIn: minutes * 60, jwtid: jti, issuer: ISSUER });
  return { token, jtiHash: hashJti(jti), expiresAt: new Date((iat + minutes * 60) * 1000) };
}

/**
 * Stores a link (and its audit row) for the user with this address in one statement: for an
 * unknown address the insert finds no user and stores nothing, so both cases cost the same
 * single round trip.
 */
export async function storeLinkForAddress(
  db: Db | Tx,
  link: SignedLink,
  email: string,
  purpose: LinkPurpose,
  userFilter: ReturnType<typeof sql>,
  audit: { action: string; ip: string; at: Date },
): Promise<{ userId: string } | null> {
  const rows = await db.execute<{ user_id: string }>(sql`
    with link as (
      insert into ${signInLinks} (jti_hash, email, user_id, purpose, expires_at)
      select ${link.jtiHash}, ${email}, u.id, ${purpose}, ${link.expiresAt.toISOString()}::timestamptz
      from ${users} u
      where u.email = ${email} and u.disabled_at is null and (${userFilter})
      limit 1
      returning user_id
    ), logged as (
      insert into ${auditEvents} (action, actor_user_id, subject, ip, at)
      select ${audit.action}, user_id, ${email}, ${audit.ip}, ${audit.at.toISOString()}::timestamptz from link
    )
    select user_id from link`);
  const row = rows.rows[0];
  return row ? { userId: row.user_id } : null;
}

/** Issues and stores a link for a known user (invitations, test sign-ins). */
export async function issueLink(db: Db | Tx, secret: string, now: Date, user: { id: string; email: string }, purpose: LinkPurpose, minutes: number): Promise<string> {
  const link = signLinkToken(secret, now, user.email, purpose, minutes);
  await db.insert(signInLinks).values({ jtiHash: link.jtiHash, email: user.email, userId: user.id, purpose, expiresAt: link.expiresAt });
  return link.token;
}

const linkError = (code: string, message: string) => new AppError(400, code, message, { token: message });

/**
 * Uses up a link exactly once. The single conditional UPDATE is the guard: of two clicks in a
 * race only one finds used_at still empty.
 */
export async function consumeLink(db: Db | Tx, secret: string, now: Date, token: string, purpose: LinkPurpose): Promise<{ userId: string; email: string }> {
  const what = purpose === 'sign_in' ? 'sign-in link' : 'link';
  let claims: LinkClaims;
  try {
    const decoded = jwt.verify(token, secret, { algorithms: ['HS256'], issuer: ISSUER, clockTimestamp: Math.floor(now.getTime() / 1000) });
    if (typeof decoded === 'string' || typeof decoded.sub !== 'string' || typeof decoded.jti !== 'string') throw new Error('shape');
    claims = { sub: decoded.sub, jti: decoded.jti, purpose: decoded.purpose as LinkPurpose };
  } catch (err) {
    if (err instanceof jwt.TokenExpiredError) throw linkError('link_expired', `This ${what} has expired. Please ask for a new one.`);
    throw linkError('link_invalid', `This ${what} is not valid. Please ask for a new one.`);
  }
  if (claims.purpose !== purpose) throw linkError('link_invalid', `This ${what} is not valid. Please ask for a new one.`);
  const jtiHash = hashJti(claims.jti);
  const [used] = await db
    .update(signInLinks)
    .set({ usedAt: now })
    .where(and(eq(signInLinks.jtiHash, jtiHash), eq(signInLinks.email, claims.sub), eq(signInLinks.purpose, purpose), isNull(signInLinks.usedAt), gt(signInLinks.expiresAt, now)))
    .returning({ userId: signInLinks.userId, email: signInLinks.email });
  if (used?.userId) return { userId: used.userId, email: used.email };

  // Say why, so the homeowner knows to ask again.
  const [row] = await db.select().from(signInLinks).where(eq(signInLinks.jtiHash, jtiHash)).limit(1);
  if (!row) throw linkError('link_invalid', `This ${what} is not valid. Please ask for a new one.`);
  if (row.email !== claims.sub) throw linkError('link_wrong_address', `This ${what} was not sent to this address. Please ask for a new one.`);
  if (row.usedAt) throw linkError('link_used', `This ${what} has already been used. Please ask for a new one.`);
  throw linkError('link_expired', `This ${what} has expired. Please ask for a new one.`);
}
