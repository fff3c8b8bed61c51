import type { ErrorRequestHandler, RequestHandler } from 'express';
import { z } from 'zod';

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
function sqlState(err: unknown): { code?: string; constraint?: string } {
  const e = err as { code?: string; constraint?: string; cause?: { code?: string; constraint?: string } };
  if (e?.cause?.code) return e.cause;
  return e ?? {};
}

export function fromDatabaseError(err: unknown): AppError | null {
  const { code, constraint } = sqlState(err);
  switch (code) {
    case '23505':
      return new AppError(409, 'duplicate', 'A record with these details already exists.', constraint ? { _: constraint } : undefined);
    case '23P01':
      return new AppError(409, 'overlap', 'That time overlaps another booking.');
    case '23503':
      return new AppError(409, 'still_referenced', 'This record is linked to other records.');
    case '23514':
      return new AppError(422, 'check_failed', 'A value is outside what is allowed.', constraint ? { _: constraint } : undefined);
    case '22P02':
      return new AppError(404, 'not_found', 'That record was not found.');
    default:
      return null;
  }
}

export const apiNotFound: RequestHandler = (req) => {
  throw new AppError(404, 'not_found', `No API route for ${req.method} ${req.originalUrl.split("?")[0]}.`);
};

export const errorHandler: ErrorRequestHandler = (err, req, res, _next) => {
  let appErr: AppError | null = err instanceof AppError ? err : null;
  if (!appErr && err instanceof z.ZodError) appErr = validationError(err);
  if (!appErr) appErr = fromDatabaseError(err);
  const e = err as { type?: string; status?: number; statusCode?: number };
  if (!appErr && e?.type === 'entity.parse.failed') appErr = new AppError(400, 'bad_json', 'The request body is not valid JSON.');
  if (!appErr && e?.type === 'entity.too.large') appErr = new AppError(413, 'too_large', 'The request is too large.');
  if (!appErr) {
    req.log?.error({ err }, 'unhandled error');
    appErr = new AppError(500, 'internal', 'Something went wrong on our side. Please try again.');
  }
  if (res.headersSent) return;
  res.status(appErr.status).json({ error: { code: appErr.code, message: appErr.message, ...(appErr.fields ? { fields: appErr.fields } : {}) } });
};
