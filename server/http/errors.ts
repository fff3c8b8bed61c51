import type { ErrorRequestHandler, RequestHandler } from 'express';
import * as z from 'zod';
import { MoneyError } from '../../shared/money';

/** An error with an HTTP status and a stable code; the message is safe to show to the user. */
export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields?: Record<string, string>,
  ) {
    super(message);
  }
}

export const notFound = (what = 'That record') => new AppError(404, 'not_found', `${what} was not found.`);
export const forbidden = () => new AppError(403, 'forbidden', 'You do not have access to this.');
export const unauthenticated = () => new AppError(401, 'unauthenticated', 'Please sign in first.');
export const conflict = (message: string) => new AppError(409, 'conflict', message);

/** Zod issues as { "address.zip": "ZIP code has 5 digits." }: the first message per field. */
export function fieldErrors(error: z.ZodError): Record<string, string> {
  const fields: Record<string, string> = {};
  for (const issue of error.issues) {
    const key = issue.path.length ? issue.path.join('.') : '_';
    fields[key] ??= issue.message;
  }
  return fields;
}

export function validationError(error: z.ZodError): AppError {
  const fields = fieldErrors(error);
  const names = Object.keys(fields).filter((k) => k !== '_');
  const message = names.length ? `Please check ${names.join(', ')}.` : (fields._ ?? 'The request is not valid.');
  return new AppError(422, 'validation_failed', message, fields);
}

/** Parses input with a zod schema, throwing a 422 that names each field. */
export function parse<S extends z.ZodType>(schema: S, input: unknown): z.infer<S> {
  const result = schema.safeParse(input);
  if (!result.success) throw validationError(result.error);
  return result.data;
}

// SQLSTATE codes from PostgreSQL; Drizzle wraps the driver error, so look at err.cause too.
function sqlState(err: unknown): { code?: string; constraint?: string; column?: string } {
  const e = err as { code?: string; constraint?: string; cause?: { code?: string; constraint?: string; column?: string } };
  if (e?.cause?.code) return e.cause;
  return e ?? {};
}

const badInput = (status: number, code: string, message: string, column?: string) => new AppError(status, code, message, column ? { [column]: message } : undefined);

/**
 * Constraint and data errors (PostgreSQL manual, Appendix A "Error Codes") as 4xx answers. The
 * data-exception ones (class 22) are caused by input that slipped past a schema: a last line of
 * defence, never a 500.
 */
export function fromDatabaseError(err: unknown): AppError | null {
  const { code, constraint, column } = sqlState(err);
  switch (code) {
    case '23505':
      return new AppError(409, 'duplicate', 'A record with these details already exists.', constraint ? { _: constraint } : undefined);
    case '23P01':
      return new AppError(409, 'overlap', 'That time overlaps another booking.');
    case '23503':
      return new AppError(409, 'still_referenced', 'This record is linked to other records.');
    case '23514':
      return new AppError(422, 'check_failed', 'A value is outside what is allowed.', constraint ? { _: constraint } : undefined);
    case '22P02': // invalid_text_representation, e.g. a malformed uuid
      return badInput(400, 'bad_input', 'A value in the request is not in the right form.', column);
    case '22003': // numeric_value_out_of_range
      return badInput(422, 'out_of_range', 'A number in the request is too large.', column);
    case '22008': // datetime_field_overflow
    case '22007': // invalid_datetime_format
      return badInput(422, 'bad_date', 'A date in the request is not valid.', column);
    case '22021': // character_not_in_repertoire
    case '22P05': // untranslatable_character
      return badInput(400, 'bad_text', 'The request contains text that cannot be stored.', column);
    case '22001': // string_data_right_truncation
      return badInput(422, 'too_long', 'A value in the request is too long.', column);
    default:
      return null;
  }
}

export const apiNotFound: RequestHandler = (req) => {
  throw new AppError(404, 'not_found', `No API route for ${req.method} ${req.originalUrl.split('?')[0]}.`);
};

/** Whatever nothing else answered (a write to a client path, a missing asset): 404 in the one shape. */
export const notFoundAnywhere: RequestHandler = () => {
  throw new AppError(404, 'not_found', 'That was not found.');
};

// Errors from body-parser and raw-body carry a `type`; each keeps its status (body-parser README).
const BODY_ERRORS: Record<string, [number, string, string]> = {
  'entity.parse.failed': [400, 'bad_json', 'The request body is not valid JSON.'],
  'entity.too.large': [413, 'too_large', 'The request is too large.'],
  'encoding.unsupported': [415, 'unsupported_encoding', 'The request body uses a Content-Encoding we do not read.'],
  'charset.unsupported': [415, 'unsupported_charset', 'Send the request body as UTF-8.'],
  'parameters.too.many': [400, 'too_many_fields', 'The request has too many fields.'],
  'request.aborted': [400, 'aborted', 'The request ended before its body was complete.'],
  'request.size.invalid': [400, 'bad_length', 'The request body does not match its Content-Length.'],
  'entity.verify.failed': [403, 'forbidden', 'The request body was refused.'],
};

/** Generic answers for other client errors the framework raises with a status. */
const STATUS_ERRORS: Record<number, [string, string]> = {
  400: ['bad_request', 'The request is not valid.'],
  404: ['not_found', 'That was not found.'],
  405: ['method_not_allowed', 'That method is not allowed here.'],
  413: ['too_large', 'The request is too large.'],
  415: ['unsupported_media_type', 'The request body is in a format we do not read.'],
};

/** Seconds a client should wait before trying again while the database is away. */
export const RETRY_AFTER_SECONDS = 5;

// Connection-level faults: class 08 (connection exception) and 57P01-57P03 (the server shutting
// down or starting up; PostgreSQL manual, Appendix A), and the socket errors of a server that is
// gone (Node "Common system errors"). None is the caller's fault and each passes by itself.
const UNAVAILABLE_CODES = new Set(['ECONNREFUSED', 'ECONNRESET', 'EPIPE', 'ETIMEDOUT', 'ENOTFOUND', 'EAI_AGAIN', '57P01', '57P02', '57P03']);
const UNAVAILABLE_MESSAGES =
  /Connection terminated|timeout exceeded when trying to connect|Client has encountered a connection error|the database system is (starting up|shutting down)/;

/** True when `err` (or what it wraps) says the database cannot be reached just now. */
export function databaseUnavailable(err: unknown): boolean {
  for (let e = err as { code?: unknown; message?: unknown; cause?: unknown; errors?: unknown[] } | undefined, depth = 0; e && depth < 5; e = e.cause as typeof e, depth++) {
    const code = typeof e.code === 'string' ? e.code : '';
    if (UNAVAILABLE_CODES.has(code) || code.startsWith('08')) return true;
    if (typeof e.message === 'string' && UNAVAILABLE_MESSAGES.test(e.message)) return true;
    // A refused connection to "localhost" tries each address and reports them together.
    if (Array.isArray(e.errors) && e.errors.some((x) => databaseUnavailable(x))) return true;
  }
  return false;
}

/** What any thrown value means for the caller; null means it is our fault (500). */
export function toAppError(err: unknown): AppError | null {
  if (err instanceof AppError) return err;
  if (err instanceof z.ZodError) return validationError(err);
  if (err instanceof MoneyError) return new AppError(422, 'validation_failed', `Please check ${err.field}.`, { [err.field]: err.message });
  const db = fromDatabaseError(err);
  if (db) return db;
  // The router and `send` mark a %-escape that does not decode (RFC 3986 §2.1) with status 400.
  if (err instanceof URIError) return new AppError(400, 'bad_uri', 'The address has a malformed %-escape.');
  const e = err as { type?: string; status?: unknown; statusCode?: unknown };
  const known = typeof e?.type === 'string' ? BODY_ERRORS[e.type] : undefined;
  if (known) return new AppError(...known);
  if (databaseUnavailable(err)) return new AppError(503, 'unavailable', 'The service is briefly unavailable. Please try again in a moment.');
  // zlib's own codes (Node "Zlib" docs) when a body is not what its Content-Encoding says.
  const zlibCode = (err as { code?: unknown })?.code;
  if (typeof zlibCode === 'string' && zlibCode.startsWith('Z_')) return new AppError(400, 'bad_encoding', 'The request body does not match its Content-Encoding.');
  const status = typeof e?.status === 'number' ? e.status : typeof e?.statusCode === 'number' ? e.statusCode : 0;
  if (status >= 400 && status < 500) {
    const [code, message] = STATUS_ERRORS[status] ?? ['bad_request', 'The request is not valid.'];
    return new AppError(status, code, message);
  }
  return null;
}

export const errorHandler: ErrorRequestHandler = (err, req, res, _next) => {
  let appErr = toAppError(err);
  if (!appErr) {
    req.log?.error({ err }, 'unhandled error');
    appErr = new AppError(500, 'internal', 'Something went wrong on our side. Please try again.');
  }
  if (res.headersSent) return;
  if (appErr.status === 503) res.setHeader('Retry-After', String(RETRY_AFTER_SECONDS));
  res.status(appErr.status).json({ error: { code: appErr.code, message: appErr.message, ...(appErr.fields ? { fields: appErr.fields } : {}) } });
};
