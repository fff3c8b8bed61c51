import type { Router } from 'express';
import type { AppDeps } from './deps';
import { agreementRoutes } from './agreements/agreements.routes';
import { billingRoutes } from './billing/billing.routes';
import { planRoutes } from './plans/plans.routes';
import { renewalRoutes } from './renewals/renewals.routes';
import { webhookRoutes } from './webhooks/webhooks.routes';
import { unsubscribeRoutes } from './mail/unsubscribe.routes';
import { UNSUBSCRIBE_PATH } from './mail/unsubscribe';
import { auditRoutes } from './audit/audit.routes';
import { authRoutes } from './auth/auth.routes';
import { sessionRoutes } from './auth/session.routes';
import { fieldRoutes } from './field/field.routes';
import { healthRoutes } from './health/health.routes';
import { bookingRoutes } from './booking/booking.routes';
import { dispatchRoutes } from './dispatch/dispatch.routes';
import { scheduleRoutes } from './schedule/schedule.routes';
import { campaignRoutes } from './campaigns/campaigns.routes';
import { settingsRoutes } from './settings/settings.routes';
import { customerRoutes, propertyRoutes } from './customers/customers.routes';
import { myHomeRoutes } from './customers/my-home.routes';
import { equipmentRoutes } from './equipment/equipment.routes';
import { uploadRoutes } from './uploads/uploads.routes';
import { importRoutes } from './imports/imports.routes';
import { priceBookRoutes } from './pricebook/pricebook.routes';
import { stockRoutes } from './stock/stock.routes';
import { portalQuoteRoutes, quoteRoutes, workInvoiceRoutes } from './quotes/quotes.routes';
import { portalReadingsRoutes, visitSummaryRoutes } from './portal-readings/portal-readings.routes';

export interface ApiRouter {
  path: string;
  build: (deps: AppDeps) => Router;
  /** Mounted before the JSON body parser (webhooks need the raw body). */
  rawBody?: boolean;
  /** Takes multipart/form-data uploads besides JSON. */
  multipart?: boolean;
}

// Every API router, one line each. The access-control test walks all of them.
export const apiRouters: ApiRouter[] = [
  { path: '/api/health', build: healthRoutes },
  { path: '/api/webhooks', build: webhookRoutes, rawBody: true },
  // Mail programs post the one-click opt-out as a form (RFC 8058): a raw-body mount, signed by its token.
  { path: UNSUBSCRIBE_PATH, build: unsubscribeRoutes, rawBody: true },
  { path: '/api/plans', build: planRoutes },
  { path: '/api/agreements', build: agreementRoutes },
  { path: '/api/invoices', build: billingRoutes },
  { path: '/api/renewals', build: renewalRoutes },
  { path: '/api/reminders', build: campaignRoutes },
  { path: '/api/settings', build: settingsRoutes },
  { path: '/api/session', build: sessionRoutes },
  { path: '/api/auth', build: authRoutes },
  { path: '/api/audit', build: auditRoutes },
  { path: '/api/field', build: fieldRoutes },
  { path: '/api/booking', build: bookingRoutes },
  { path: '/api/dispatch', build: dispatchRoutes },
  { path: '/api/schedule', build: scheduleRoutes },
  { path: '/api/portal/readings', build: portalReadingsRoutes },
  { path: '/api/portal/visit-summaries', build: visitSummaryRoutes },
  { path: '/api/customers', build: customerRoutes },
  { path: '/api/properties', build: propertyRoutes },
  { path: '/api/equipment', build: equipmentRoutes },
  { path: '/api/files', build: uploadRoutes, multipart: true },
  { path: '/api/imports', build: importRoutes, multipart: true },
  { path: '/api/my-home', build: myHomeRoutes },
  { path: '/api/price-book', build: priceBookRoutes, multipart: true },
  { path: '/api/quotes', build: quoteRoutes },
  { path: '/api/portal/quotes', build: portalQuoteRoutes },
  { path: '/api/work-invoices', build: workInvoiceRoutes },
  { path: '/api/stock', build: stockRoutes },
];
