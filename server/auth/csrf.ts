import { createHmac, randomBytes, timingSafeEqual } from 'node:crypto';
import type { Request, RequestHandler, Response } from 'express';
import type { Config } from '../config';
import { AppError } from '../http/errors';
import { SAFE_METHODS, underMount } from '../http/edge';

// Angular's HttpClient reads this cookie and echoes it in the header on its own.
export const CSRF_COOKIE = 'XSRF-TOKEN';
export const CSRF_HEADER = 'x-xsrf-token';

function mac(secret: string, sessionId: string, nonce: string): string {
  return createHmac('sha256', secret).update(`${sessionId}.${nonce}`).digest('base64url');
}

/** A signed double-submit token: random nonce plus an HMAC binding it to this session id. */
export function csrfTokenFor(secret: string, sessionId: string): string {
  const nonce = randomBytes(18).toString('base64url');
  return `${nonce}.${mac(secret, sessionId, nonce)}`;
}

export function csrfTokenValid(secret: string, sessionId: string, token: string): boolean {
  const [nonce, sig, extra] = token.split('.');
  if (!nonce || !sig || extra !== undefined) return false;
  const want = Buffer.from(mac(secret, sessionId, nonce));
  const got = Buffer.from(sig);
  return want.length === got.length && timingSafeEqual(want, got);
}

function readCookie(req: Request, name: string): string | undefined {
  const header = req.headers.cookie;
  if (!header) return undefined;
  for (const part of header.split(';')) {
    const eq = part.indexOf('=');
    if (eq > 0 && part.slice(0, eq).trim() === name) {
      try {
        return decodeURIComponent(part.slice(eq + 1).trim());
      } catch {
        return undefined;
      }
    }
  }
  return undefined;
}

/**
 * Sets the token cookie for the current session id. A still-valid token is kept, so other tabs
 * and callers holding it are not invalidated; sign-in and sign-out change the id and so the token.
 */
export function issueCsrf(req: Request, res: Response, config: Config): string {
  // A session must be stored for its id (and so the token) to stay the same on the next request.
  req.session.csrfIssuedAt ??= Date.now();
  const current = readCookie(req, CSRF_COOKIE);
  if (current && csrfTokenValid(config.SESSION_SECRET, req.sessionID, current)) return current;
  const token = csrfTokenFor(config.SESSION_SECRET, req.sessionID);
  res.cookie(CSRF_COOKIE, token, { httpOnly: false, sameSite: 'lax', secure: config.production, path: '/' });
  return token;
}

const csrfError = (message: string) => new AppError(403, 'csrf_failed', message);

/**
 * Every state-changing request, on any path and in any spelling, must carry the token from the
 * cookie in the header, signed for this session. The only exceptions are the raw-body mounts
 * (signed webhooks), matched exactly as the case-sensitive router matches them. Foreign origins
 * were already refused by sameOriginWrites, before the session was read.
 */
export function csrfProtection(config: Config, exemptMounts: string[]): RequestHandler {
  return (req, _res, next) => {
    if (SAFE_METHODS.has(req.method)) return next();
    if (exemptMounts.some((m) => underMount(req.path, m))) return next();
    const header = req.get(CSRF_HEADER);
    const cookie = readCookie(req, CSRF_COOKIE);
    if (!header || !cookie) throw csrfError('The security token is missing. Please reload the page and try again.');
    if (header !== cookie || !csrfTokenValid(config.SESSION_SECRET, req.sessionID, header)) {
      throw csrfError('The security token is not valid. Please reload the page and try again.');
    }
    next();
  };
}
