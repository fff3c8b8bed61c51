import { Router } from 'express';
import * as z from 'zod';
import { importMappingSchema } from '../../shared/schemas/customers';
import type { AppDeps } from '../deps';
import { requireRole } from '../auth/access';
import { AppError, parse } from '../http/errors';
import { multipart } from '../uploads/multipart';
import { checkImport, previewCsv, runImport } from './csv.service';

export const mappingField = z.object({
  mapping: z.string({ error: 'Send the column mapping.' }).transform((s, ctx) => {
    try {
      return JSON.parse(s) as unknown;
    } catch {
      ctx.addIssue({ code: 'custom', message: 'The column mapping is not valid JSON.' });
      return z.NEVER;
    }
  }),
});

/** CSV import of households, properties and equipment: preview, check, then import all or nothing. */
export function importRoutes(deps: AppDeps): Router {
  const r = Router({ caseSensitive: true, strict: true });
  r.use(requireRole('office', 'owner'));
  const csv = multipart('file', { maxFiles: 1 });
  const fileOf = (req: import('express').Request) => {
    const f = (req.files as Express.Multer.File[] | undefined)?.[0];
    if (!f) throw new AppError(422, 'validation_failed', 'Please check file.', { file: 'Choose a CSV file.' });
    return f.buffer;
  };
  const mappingOf = (req: import('express').Request) => parse(importMappingSchema, parse(mappingField, req.body ?? {}).mapping);

  r.post('/preview', csv, (req, res) => {
    res.json(previewCsv(fileOf(req)));
  });

  r.post('/check', csv, async (req, res) => {
    res.json(await checkImport(deps, fileOf(req), mappingOf(req)));
  });

  r.post('/run', csv, async (req, res) => {
    res.status(201).json(await runImport(deps, fileOf(req), mappingOf(req)));
  });

  return r;
}
