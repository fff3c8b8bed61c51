import type { RequestHandler } from 'express';
import multer from 'multer';
import { assertStorableText } from '../http/edge';
import { AppError } from '../http/errors';

/** Multipart fields and file names get the same storable-text check as JSON bodies. */
function storableFields(req: Parameters<RequestHandler>[0], field: string, next: (err?: unknown) => void): void {
  try {
    assertStorableText(req.body ?? {});
    const names = ((req.files as Express.Multer.File[] | undefined) ?? []).map((f) => f.originalname);
    assertStorableText({ [field]: names.join('/') });
  } catch (err) {
    return next(err);
  }
  next();
}

export const MAX_UPLOAD_BYTES = 10 * 1024 * 1024;
export const MAX_UPLOAD_FILES = 10;

/**
 * Multipart parsing into memory with our limits; multer's errors become our error shape
 * (413 for size and count). Nothing is written anywhere until the content has been checked.
 */
export function multipart(field: string, o: { maxFiles?: number; maxBytes?: number } = {}): RequestHandler {
  const maxFiles = o.maxFiles ?? MAX_UPLOAD_FILES;
  const maxBytes = o.maxBytes ?? MAX_UPLOAD_BYTES;
  const upload = multer({
    storage: multer.memoryStorage(),
    limits: { fileSize: maxBytes, files: maxFiles, fields: 20, fieldSize: 64 * 1024, parts: maxFiles + 20 },
  }).array(field, maxFiles);
  return (req, res, next) => {
    if (!req.is('multipart/form-data')) return next(new AppError(415, 'not_multipart', 'Send the files as multipart/form-data.'));
    upload(req, res, (err: unknown) => {
      if (!err) return storableFields(req, field, next);
      if (err instanceof multer.MulterError) {
        switch (err.code) {
          case 'LIMIT_FILE_SIZE':
            return next(
              new AppError(413, 'file_too_large', `Each file can be at most ${maxBytes / 1024 / 1024} MB.`, { [field]: `Each file can be at most ${maxBytes / 1024 / 1024} MB.` }),
            );
          case 'LIMIT_FILE_COUNT':
          case 'LIMIT_UNEXPECTED_FILE':
            return next(
              err.code === 'LIMIT_FILE_COUNT' || err.field === field
                ? new AppError(413, 'too_many_files', `Send at most ${maxFiles} file${maxFiles === 1 ? '' : 's'} at a time.`, {
                    [field]: `Send at most ${maxFiles} file${maxFiles === 1 ? '' : 's'} at a time.`,
                  })
                : new AppError(422, 'validation_failed', `Please check ${err.field}.`, { [err.field ?? field]: `Send files in the "${field}" field.` }),
            );
          case 'LIMIT_FIELD_COUNT':
          case 'LIMIT_PART_COUNT':
            return next(new AppError(400, 'too_many_fields', 'The upload has too many fields.'));
          default:
            return next(new AppError(413, 'too_large', 'The upload is too large.'));
        }
      }
      // busboy's own errors are malformed bodies (truncated, no boundary): the sender's fault.
      next(err instanceof Error && !('status' in err) ? new AppError(400, 'bad_multipart', 'The upload is not a complete multipart/form-data body.') : err);
    });
  };
}
