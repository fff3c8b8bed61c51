import { createHmac, randomBytes, timingSafeEqual } from 'node:crypto';
import type { Request, RequestHandler, Response } from 'express';
import type { Config } from '../config';
import { AppError } from '../http/errors';

// Angular's HttpClient reads this cookie and echoes it in the header on its own.
export const CSRF_COOKIE = 'XSRF-TOKEN';
export const CSRF_HEADER = 'x-xsrf-token';
const UNSAFE = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);

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

function ownOrigins(req: Request, config: Config): Set<string> {
  const origins = new Set([new URL(config.publicUrl).origin]);
  const host = req.get('host');
  if (host) origins.add(`${req.protocol}://${host}`);
  return origins;
}

/**
 * Every state-changing /api request must come from our own origin (when the browser says) and
 * carry the token from the cookie in the header, signed for this session.
 */
export function csrfProtection(config: Config, exemptPaths: string[]): RequestHandler {
  return (req, _res, next) => {
    if (!UNSAFE.has(req.method) || !req.path.startsWith('/api/')) return next();
    if (exemptPaths.some((p) => req.path === p || req.path.startsWith(`${p}/`))) return next();
    const origin = req.get('origin');
    if (origin !== undefined && !ownOrigins(req, config).has(origin)) {
      throw csrfError('This request came from another site and was refused.');
    }
    const header = req.get(CSRF_HEADER);
    const cookie = readCookie(req, CSRF_COOKIE);
    if (!header || !cookie) throw csrfError('The security token is missing. Please reload the page and try again.');
    if (header !== cookie || !csrfTokenValid(config.SESSION_SECRET, req.sessionID, header)) {
      throw csrfError('The security token is not valid. Please reload the page and try again.');
    }
    next();
  };
}
