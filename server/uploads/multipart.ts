import type { RequestHandler } from 'express';
import multer from 'multer';
import { AppError } from '../http/errors';

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
      if (!err) return next();
      if (err instanceof multer.MulterError) {
        switch (err.code) {
          case 'LIMIT_FILE_SIZE':
            return next(new AppError(413, 'file_too_large', `Each file can be at most ${maxBytes / 1024 / 1024} MB.`, { [field]: `Each file can be at most ${maxBytes / 1024 / 1024} MB.` }));
          case 'LIMIT_FILE_COUNT':
          case 'LIMIT_UNEXPECTED_FILE':
            return next(
              err.code === 'LIMIT_FILE_COUNT' || err.field === field
                ? new AppError(413, 'too_many_files', `Send at most ${maxFiles} file${maxFiles === 1 ? '' : 's'} at a time.`, { [field]: `Send at most ${maxFiles} file${maxFiles === 1 ? '' : 's'} at a time.` })
                : new AppError(422, 'validation_failed', `Please check ${err.field}.`, { [err.field ?? field]: `Send files in the "${field}" field.` }),
            );
          default:
            return next(new AppError(413, 'too_large', 'The upload is too large.'));
        }
      }
      next(err);
    });
  };
}
