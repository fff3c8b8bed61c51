import type { Request, RequestHandler, Router } from 'express';
import * as z from 'zod';
import type { Config } from '../config';
import { AppError, notFound } from './errors';

// Checks every request passes before any feature code runs: where it came from, what kind of
// body it carries, and whether its text can be stored at all.

/** Options for every router: paths match exactly as written, so the guards see what routes. */
export const ROUTER_OPTIONS = { caseSensitive: true, strict: true } as const;

/** Methods that never change anything; every other method is guarded (deny by default). */
export const SAFE_METHODS: ReadonlySet<string> = new Set(['GET', 'HEAD', 'OPTIONS']);

/**
 * True when `path` is inside the router mounted at `mount`, compared the way a case-sensitive
 * Express mount compares: the raw (not decoded) path, exact letters, then "/" or the end.
 */
export function underMount(path: string, mount: string): boolean {
  return path === mount || path.startsWith(`${mount}/`);
}

export const refusedFromElsewhere = () => new AppError(403, 'csrf_failed', 'This request came from another site and was refused.');

function ownOrigins(req: Request, config: Config): Set<string> {
  const origins = new Set([new URL(config.publicUrl).origin]);
  const host = req.get('host');
  if (host) origins.add(`${req.protocol}://${host}`);
  return origins;
}

/**
 * Refuses state-changing requests another site started: a foreign Origin (including "null" from
 * sandboxed frames), or Fetch Metadata saying the request is not same-origin (W3C Fetch Metadata
 * Request Headers; OWASP CSRF Prevention Cheat Sheet). Runs first, before sessions and bodies.
 */
export function sameOriginWrites(config: Config, exemptPaths: readonly string[] = []): RequestHandler {
  return (req, _res, next) => {
    if (SAFE_METHODS.has(req.method)) return next();
    // A mail program's one-click opt-out posts from its own origin (RFC 8058); exactly that path, carrying its signed token.
    if (exemptPaths.includes(req.path)) return next();
    // "none" is a user typing the address or a bookmark; both it and same-origin are ours.
    const site = req.get('sec-fetch-site');
    if (site !== undefined && site !== 'same-origin' && site !== 'none') throw refusedFromElsewhere();
    const origin = req.get('origin');
    if (origin !== undefined && !ownOrigins(req, config).has(origin)) throw refusedFromElsewhere();
    next();
  };
}

/** A body is present when it has a length above zero or comes chunked (RFC 9112 §6.3). */
function hasBody(req: Request): boolean {
  const length = req.headers['content-length'];
  return req.headers['transfer-encoding'] !== undefined || (length !== undefined && length !== '0');
}

/**
 * The API reads JSON only. Upload routes also take multipart/form-data; raw-body routes (signed
 * webhooks) read their own bytes. Anything else is a 415 before the body is read.
 */
export function jsonBodiesOnly(o: { multipartMounts: string[]; rawMounts: string[] }): RequestHandler {
  return (req, _res, next) => {
    if (!hasBody(req) || o.rawMounts.some((m) => underMount(req.path, m))) return next();
    if (req.is('application/json')) return next();
    if (req.is('multipart/form-data') && o.multipartMounts.some((m) => underMount(req.path, m))) return next();
    throw new AppError(415, 'unsupported_media_type', 'Send the request body as JSON (Content-Type: application/json).');
  };
}

// ---- Text PostgreSQL cannot store ----

/** Deeper than any form we have; a deeper body is a probe. */
export const MAX_BODY_DEPTH = 32;

const NUL = '\u0000';
// A high surrogate not followed by a low one, or a low one not preceded by a high one.
const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;

/**
 * Why a string cannot be stored in a PostgreSQL text column, or null. NUL is not allowed in text
 * (PostgreSQL manual, "Character Types"); a lone surrogate has no UTF-8 form (RFC 3629 §3).
 */
export function unstorable(s: string): string | null {
  if (s.includes(NUL)) return 'Contains a NUL character, which cannot be stored.';
  if (LONE_SURROGATE.test(s)) return 'Contains a broken character (half of a UTF-16 pair).';
  return null;
}

const badText = (field: string, why: string) =>
  new AppError(400, 'bad_text', field === '_' ? 'The request contains text that cannot be stored.' : `Please check ${field}.`, { [field]: why });

/**
 * Throws a 400 naming the first field (keys and values, at any depth, "lines.0.description"
 * like zod's paths) whose text cannot be stored. Iterative, so no body can exhaust the stack.
 */
export function assertStorableText(value: unknown, prefix: string[] = []): void {
  const stack: { v: unknown; path: string[] }[] = [{ v: value, path: prefix }];
  while (stack.length) {
    const { v, path } = stack.pop()!;
    const name = path.length ? path.join('.') : '_';
    if (typeof v === 'string') {
      const why = unstorable(v);
      if (why) throw badText(name, why);
    } else if (v !== null && typeof v === 'object' && !Buffer.isBuffer(v)) {
      if (path.length - prefix.length >= MAX_BODY_DEPTH) throw new AppError(400, 'too_deep', 'The request body is nested too deeply.');
      for (const [k, child] of Object.entries(v)) {
        const why = unstorable(k);
        // eslint-disable-next-line no-control-regex -- NUL is the character PostgreSQL cannot store
        if (why) throw badText([...path, k.replace(/[\uD800-\uDFFF\u0000]/g, '?')].join('.'), why);
        stack.push({ v: child, path: [...path, k] });
      }
    }
  }
}

// Headers whose values the app keeps: the forwarded address becomes req.ip in the audit trail.
// Node's HTTP parser already refuses NUL in any header (llhttp); this holds if that ever changes.
const STORED_HEADERS = ['x-forwarded-for'] as const;

/** The one check for unstorable text in the JSON body, the query string and kept headers. */
export const storableTextOnly: RequestHandler = (req, _res, next) => {
  assertStorableText(req.query);
  if (req.body !== undefined && !Buffer.isBuffer(req.body)) assertStorableText(req.body);
  for (const h of STORED_HEADERS) {
    const v = req.headers[h];
    if (typeof v === 'string' && unstorable(v)) throw badText(h, unstorable(v)!);
  }
  next();
};

// ---- Path parameters ----

/** Path parameters that are row ids; every table keys on a uuid. */
const ID_PARAMS = new Set(['id', 'contactId', 'propertyId', 'visitId', 'customerId']);
const uuid = z.uuid();

function paramNames(router: Router): Set<string> {
  const names = new Set<string>();
  const stack = (router as unknown as { stack: { route?: { path: unknown } }[] }).stack;
  for (const layer of stack) {
    const paths = layer.route ? [layer.route.path].flat() : [];
    for (const p of paths) if (typeof p === 'string') for (const m of p.matchAll(/:(\w+)/g)) names.add(m[1]!);
  }
  return names;
}

/**
 * Checks every named path parameter of a built router before its handlers run: storable text
 * (400 naming the parameter), and row ids must be uuids (404, as no such row can exist), so a
 * malformed id never reaches SQL.
 */
export function guardParams<R extends Router>(router: R): R {
  for (const name of paramNames(router)) {
    router.param(name, (_req, _res, next, value: unknown) => {
      if (typeof value === 'string') {
        const why = unstorable(value);
        if (why) return next(badText(name, why));
        if (ID_PARAMS.has(name) && !uuid.safeParse(value).success) return next(notFound());
      }
      next();
    });
  }
  return router;
}
