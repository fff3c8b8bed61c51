import { randomUUID } from 'node:crypto';
import { Router } from 'express';
import * as z from 'zod';
import { createInvoiceSchema, invoiceListQuerySchema, offlinePaymentSchema, refundSchema } from '../../shared/schemas/billing';
import type { AppDeps } from '../deps';
import { assertCustomerAccess, currentUser, requireRole, requireUser } from '../auth/access';
import { parse } from '../http/errors';
import { createServiceInvoice, issueInvoice, listInvoices, readInvoice, voidInvoice } from './invoices';
import { recordOfflinePayment, refundInvoice } from './refunds';
import { startInvoiceCheckout, syncCheckoutSession } from './checkout';
import { renderInvoicePdf } from './receipts';
import { companyRow } from '../company/company';

export const idParam = z.object({ id: z.uuid('That invoice was not found.') });
export const checkoutReturnSchema = z.object({ sessionId: z.string().regex(/^cs_[A-Za-z0-9_]{6,200}$/, 'That payment reference is not valid.') });
export const checkoutSchema = z.object({ returnPath: z.string().max(200).default('/portal/invoices') });

export function billingRoutes(deps: AppDeps): Router {
  const router = Router({ caseSensitive: true, strict: true });
  const { db } = deps.database;
  router.get('/', requireRole('homeowner', 'office', 'owner'), async (req, res) => {
    res.json(await listInvoices(deps, currentUser(req), parse(invoiceListQuerySchema, req.query)));
  });
  router.post('/', requireRole('office', 'owner'), async (req, res) => {
    res.status(201).json(await createServiceInvoice(deps, parse(createInvoiceSchema, req.body)));
  });
  // Back from the payment page: read the session from the processor (the redirect alone proves nothing).
  router.post('/checkout-return', requireUser, async (req, res) => {
    const { sessionId } = parse(checkoutReturnSchema, req.body);
    const result = await syncCheckoutSession(deps, sessionId);
    if (result.invoiceId) await readInvoice(deps, currentUser(req), result.invoiceId);
    res.json(result);
  });
  router.get('/:id', requireUser, async (req, res) => {
    res.json(await readInvoice(deps, currentUser(req), parse(idParam, req.params).id));
  });
  router.get('/:id/pdf', requireUser, async (req, res) => {
    const view = await readInvoice(deps, currentUser(req), parse(idParam, req.params).id);
    const pdf = await renderInvoicePdf(view, await companyRow(db));
    res.type('application/pdf').setHeader('Content-Disposition', `inline; filename="invoice-${view.number ?? 'draft'}.pdf"`);
    res.send(pdf);
  });
  router.post('/:id/checkout', requireRole('homeowner', 'office', 'owner'), async (req, res) => {
    const id = parse(idParam, req.params).id;
    const view = await readInvoice(deps, currentUser(req), id);
    await assertCustomerAccess(db, currentUser(req), view.customerId);
    const { returnPath } = parse(checkoutSchema, req.body ?? {});
    res.json(await startInvoiceCheckout(deps, id, { returnPath }));
  });
  router.post('/:id/issue', requireRole('office', 'owner'), async (req, res) => {
    res.json(await issueInvoice(deps, parse(idParam, req.params).id));
  });
  router.post('/:id/void', requireRole('office', 'owner'), async (req, res) => {
    res.json(await voidInvoice(deps, parse(idParam, req.params).id));
  });
  router.post('/:id/payments', requireRole('office', 'owner'), async (req, res) => {
    res.status(201).json(await recordOfflinePayment(deps, currentUser(req), parse(idParam, req.params).id, parse(offlinePaymentSchema, req.body)));
  });
  router.post('/:id/refunds', requireRole('office', 'owner'), async (req, res) => {
    const key = /^[A-Za-z0-9_-]{8,80}$/.test(req.get('idempotency-key') ?? '') ? req.get('idempotency-key')! : randomUUID();
    res.status(201).json(await refundInvoice(deps, currentUser(req), parse(idParam, req.params).id, parse(refundSchema, req.body), key));
  });
  return router;
}
