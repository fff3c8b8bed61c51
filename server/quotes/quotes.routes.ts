// Routes of quotes, the portal's quotes and work invoices: the full table is server/quotes/ROUTES.md.
import { Router, type Request } from 'express';
import * as z from 'zod';
import {
  directInvoiceSchema,
  quoteApproveSchema,
  quoteCreateSchema,
  quoteDeclineSchema,
  quoteListQuerySchema,
  quoteSendSchema,
  quoteUpdateSchema,
} from '../../shared/schemas/pricebook';
import { quoteReviseSchema, quoteRevisionQuerySchema, quoteStatsQuerySchema, visitCheckoutSchema, visitInvoicesQuerySchema } from '../../shared/schemas/quotes';
import type { AppDeps } from '../deps';
import { currentUser, requireRole } from '../auth/access';
import { AppError, notFound, parse } from '../http/errors';
import { createQuote, listQuotes, planSavings, previewQuote, quoteStats, readQuote, reviseQuote, sendQuote, updateQuote } from './quotes.service';
import { approveQuote, createWorkInvoice, declineQuote, previewWorkInvoice } from './approval';
import { startVisitCheckout, visitInvoices } from './visit-invoices';

const idOf = (raw: unknown, what = 'That quote'): string => {
  const r = z.uuid().safeParse(raw);
  if (!r.success) throw notFound(what);
  return r.data;
};
const ipOf = (req: Request) => req.ip ?? req.socket.remoteAddress ?? 'unknown';

export function quoteRoutes(deps: AppDeps): Router {
  const r = Router({ caseSensitive: true, strict: true });
  r.use(requireRole('owner', 'office', 'technician'));
  r.get('/', async (req, res) => {
    res.json(await listQuotes(deps, currentUser(req), parse(quoteListQuerySchema, req.query)));
  });
  r.get('/stats', requireRole('owner', 'office'), async (req, res) => {
    res.json(await quoteStats(deps, parse(quoteStatsQuerySchema, req.query).periodDays));
  });
  r.get('/savings/:customerId', async (req, res) => {
    res.json(await planSavings(deps, currentUser(req), idOf(req.params.customerId, 'That household')));
  });
  r.post('/preview', async (req, res) => {
    res.json(await previewQuote(deps, currentUser(req), parse(quoteCreateSchema, req.body)));
  });
  r.post('/', async (req, res) => {
    res.status(201).json(await createQuote(deps, currentUser(req), parse(quoteCreateSchema, req.body)));
  });
  r.get('/:id', async (req, res) => {
    res.json(await readQuote(deps, currentUser(req), idOf(req.params.id), parse(quoteRevisionQuerySchema, req.query).revision));
  });
  r.put('/:id', async (req, res) => {
    const id = idOf(req.params.id);
    res.json(await updateQuote(deps, currentUser(req), id, parse(quoteUpdateSchema, req.body)));
  });
  r.post('/:id/revise', async (req, res) => {
    const id = idOf(req.params.id);
    res.status(201).json(await reviseQuote(deps, currentUser(req), id, parse(quoteReviseSchema, req.body).revision));
  });
  r.post('/:id/send', async (req, res) => {
    const id = idOf(req.params.id);
    res.json(await sendQuote(deps, currentUser(req), id, parse(quoteSendSchema, req.body)));
  });
  r.post('/:id/approve', async (req, res) => {
    const id = idOf(req.params.id);
    res.json(await approveQuote(deps, currentUser(req), id, parse(quoteApproveSchema, req.body), { ip: ipOf(req), onDevice: 'technician' }));
  });
  r.post('/:id/decline', async (req, res) => {
    const id = idOf(req.params.id);
    res.json(await declineQuote(deps, currentUser(req), id, parse(quoteDeclineSchema, req.body), { ip: ipOf(req), onDevice: 'technician' }));
  });
  return r;
}

export function portalQuoteRoutes(deps: AppDeps): Router {
  const r = Router({ caseSensitive: true, strict: true });
  r.use(requireRole('homeowner'));
  const household = (req: Request) => {
    const id = currentUser(req).customerId;
    if (!id) throw new AppError(404, 'not_found', 'No household is linked to this account.');
    return id;
  };
  r.get('/', async (req, res) => {
    household(req);
    const page = await listQuotes(deps, currentUser(req), parse(quoteListQuerySchema, { pageSize: 100 }));
    res.json(page.items);
  });
  r.get('/savings', async (req, res) => {
    res.json(await planSavings(deps, currentUser(req), household(req)));
  });
  r.get('/:id', async (req, res) => {
    res.json(await readQuote(deps, currentUser(req), idOf(req.params.id)));
  });
  r.post('/:id/approve', async (req, res) => {
    const id = idOf(req.params.id);
    res.json(await approveQuote(deps, currentUser(req), id, parse(quoteApproveSchema, req.body), { ip: ipOf(req), onDevice: 'portal' }));
  });
  r.post('/:id/decline', async (req, res) => {
    const id = idOf(req.params.id);
    res.json(await declineQuote(deps, currentUser(req), id, parse(quoteDeclineSchema, req.body), { ip: ipOf(req), onDevice: 'portal' }));
  });
  return r;
}

export function workInvoiceRoutes(deps: AppDeps): Router {
  const r = Router({ caseSensitive: true, strict: true });
  r.use(requireRole('owner', 'office', 'technician'));
  r.post('/preview', async (req, res) => {
    res.json(await previewWorkInvoice(deps, currentUser(req), parse(directInvoiceSchema, req.body)));
  });
  r.post('/', async (req, res) => {
    res.status(201).json(await createWorkInvoice(deps, currentUser(req), parse(directInvoiceSchema, req.body)));
  });
  r.get('/', async (req, res) => {
    res.json(await visitInvoices(deps, currentUser(req), parse(visitInvoicesQuerySchema, req.query).visitId));
  });
  r.post('/:id/checkout', async (req, res) => {
    const id = idOf(req.params.id, 'That invoice');
    res.json(await startVisitCheckout(deps, currentUser(req), id, parse(visitCheckoutSchema, req.body).visitId));
  });
  return r;
}
