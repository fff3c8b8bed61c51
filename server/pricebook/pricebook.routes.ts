import { Router, type Request } from 'express';
import * as z from 'zod';
import {
  flatRateTaskInputSchema,
  flatRateTaskUpdateSchema,
  priceBookItemInputSchema,
  priceBookItemUpdateSchema,
  priceBookListQuerySchema,
  priceBookMappingSchema,
} from '../../shared/schemas/pricebook';
import { taskListQuerySchema } from '../../shared/schemas/quotes';
import type { AppDeps } from '../deps';
import { requireRole } from '../auth/access';
import { AppError, notFound, parse } from '../http/errors';
import { multipart } from '../uploads/multipart';
import { createItem, createTask, listItems, listTasks, readItem, updateItem, updateTask } from './pricebook.service';
import { checkPriceBookImport, exportPriceBookCsv, previewPriceBookCsv } from './pricebook.import';

const idOf = (raw: unknown, what: string): string => {
  const r = z.uuid().safeParse(raw);
  if (!r.success) throw notFound(what);
  return r.data;
};
export const priceBookMappingField = z.object({
  mapping: z.string({ error: 'Send the column mapping.' }).transform((s, ctx) => {
    try {
      return JSON.parse(s) as unknown;
    } catch {
      ctx.addIssue({ code: 'custom', message: 'The column mapping is not valid JSON.' });
      return z.NEVER;
    }
  }),
});

/** The price book: the owner edits, the office and technicians read (quotes are built from it). */
export function priceBookRoutes(deps: AppDeps): Router {
  const r = Router({ caseSensitive: true, strict: true });
  const readers = requireRole('owner', 'office', 'technician');
  const owner = requireRole('owner');
  const csv = multipart('file', { maxFiles: 1 });
  const fileOf = (req: Request) => {
    const f = (req.files as Express.Multer.File[] | undefined)?.[0];
    if (!f) throw new AppError(422, 'validation_failed', 'Please check file.', { file: 'Choose a CSV file.' });
    return f.buffer;
  };
  const mappingOf = (req: Request) => parse(priceBookMappingSchema, parse(priceBookMappingField, req.body ?? {}).mapping) as Record<string, string | null>;

  r.get('/items', readers, async (req, res) => {
    res.json(await listItems(deps, parse(priceBookListQuerySchema, req.query)));
  });
  r.get('/items/:id', readers, async (req, res) => {
    res.json(await readItem(deps, idOf(req.params.id, 'That price-book item')));
  });
  r.post('/items', owner, async (req, res) => {
    res.status(201).json(await createItem(deps, parse(priceBookItemInputSchema, req.body)));
  });
  r.patch('/items/:id', owner, async (req, res) => {
    const id = idOf(req.params.id, 'That price-book item');
    res.json(await updateItem(deps, id, parse(priceBookItemUpdateSchema, req.body)));
  });
  r.get('/tasks', readers, async (req, res) => {
    res.json(await listTasks(deps, parse(taskListQuerySchema, req.query).status));
  });
  r.post('/tasks', owner, async (req, res) => {
    res.status(201).json(await createTask(deps, parse(flatRateTaskInputSchema, req.body)));
  });
  r.patch('/tasks/:id', owner, async (req, res) => {
    const id = idOf(req.params.id, 'That flat-rate task');
    res.json(await updateTask(deps, id, parse(flatRateTaskUpdateSchema, req.body)));
  });
  r.get('/export.csv', requireRole('owner', 'office'), async (_req, res) => {
    res.type('text/csv').setHeader('Content-Disposition', 'attachment; filename="price-book.csv"');
    res.send(await exportPriceBookCsv(deps));
  });
  r.post('/import/preview', owner, csv, (req, res) => {
    res.json(previewPriceBookCsv(fileOf(req)));
  });
  r.post('/import/check', owner, csv, async (req, res) => {
    res.json(await checkPriceBookImport(deps, fileOf(req), mappingOf(req)));
  });
  r.post('/import/run', owner, csv, async (req, res) => {
    res.status(201).json(await checkPriceBookImport(deps, fileOf(req), mappingOf(req), true));
  });
  return r;
}
