import { z } from 'zod';
import type { Role } from '../shared/roles';
import {
  auditQuerySchema,
  forgotPasswordSchema,
  householdInviteSchema,
  linkConfirmSchema,
  linkRequestSchema,
  setPasswordSchema,
  staffInviteSchema,
  staffSignInSchema,
  staffUpdateSchema,
} from '../shared/schemas/auth';
import { createInvoiceSchema, invoiceListQuerySchema, offlinePaymentSchema, refundSchema } from '../shared/schemas/billing';
import { assignSchema, boardQuerySchema, bookVisitSchema, cancelSchema, rescheduleSchema, statusChangeSchema, timeOffSchema, windowsQuerySchema } from '../shared/schemas/booking';
import { createCampaignSchema, reminderPreviewQuerySchema } from '../shared/schemas/campaigns';
import {
  contactInputSchema,
  customerCreateSchema,
  customerListQuerySchema,
  customerUpdateSchema,
  homeAccessSchema,
  homeContactSchema,
  homeNoteSchema,
  mergeSchema,
  noteInputSchema,
  propertyInputSchema,
  propertyUpdateSchema,
} from '../shared/schemas/customers';
import { equipmentInputSchema, equipmentUpdateSchema } from '../shared/schemas/equipment';
import { completeVisitSchema, saveChecklistSchema, saveReadingsSchema, troubleshootingSchema, visitNotesSchema } from '../shared/schemas/field';
import {
  autoRenewSchema,
  cancelAgreementSchema,
  changeTierSchema,
  createPlanSchema,
  enrollSchema,
  manualRenewalSchema,
  planActiveSchema,
  planTermsSchema,
  renewalQuerySchema,
  renewSchema,
  sendNoticesSchema,
} from '../shared/schemas/plans';
import { companySettingsSchema } from '../shared/schemas/settings';
import { checkoutReturnSchema, checkoutSchema } from './billing/billing.routes';
import { customerQuery } from './booking/booking.routes';
import { householdQuery } from './dispatch/dispatch.routes';
import { propertyRef } from './equipment/equipment.routes';
import { seasonQuery } from './field/field.routes';
import { mappingField } from './imports/imports.routes';
import { feedParam, weekQuery } from './schedule/schedule.routes';
import { uploadTargetSchema } from './uploads/uploads.service';

/**
 * What each routed "METHOD /path" reads from the request, as the zod schemas its handler parses,
 * and the role that may call it (`as`; 'anonymous' for public routes). The route fuzz test walks
 * the router and fails for any route missing here, then sends each one invalid inputs made from
 * these schemas. Registering a route is one line:
 *   'POST /api/things/:id/do': { as: 'office', params: ids('id'), body: doThingSchema },
 * Leave out a part the route does not read.
 */
export interface RouteInputs {
  as: Role | 'anonymous';
  params?: z.ZodType;
  query?: z.ZodType;
  body?: z.ZodType;
}

/** Path parameters that are row ids (server/http/edge.ts guards them as uuids). */
export const ids = (...names: string[]) => z.object(Object.fromEntries(names.map((n) => [n, z.uuid()])));
const id = ids('id');
const signedToken = z.object({ token: z.string().max(200) });
const fileQuery = z.object({ download: z.enum(['1']).optional(), inline: z.enum(['1']).optional() });

export const ROUTE_INPUTS: Record<string, RouteInputs> = {
  'GET /api/health': { as: 'anonymous' },
  'GET /api/health/slow': { as: 'anonymous' },
  'POST /api/webhooks/stripe': { as: 'anonymous', body: z.object({ id: z.string(), type: z.string() }) },
  'GET /api/unsubscribe': { as: 'anonymous', query: signedToken },
  'POST /api/unsubscribe': { as: 'anonymous', query: signedToken },
  'GET /api/plans': { as: 'office' },
  'GET /api/plans/:id/versions': { as: 'office', params: id },
  'POST /api/plans': { as: 'owner', body: createPlanSchema },
  'PUT /api/plans/:id': { as: 'owner', params: id, body: planTermsSchema },
  'PATCH /api/plans/:id': { as: 'owner', params: id, body: planActiveSchema },
  'GET /api/agreements/mine': { as: 'homeowner' },
  'POST /api/agreements/enroll': { as: 'homeowner', body: enrollSchema },
  'GET /api/agreements/:id': { as: 'homeowner', params: id },
  'POST /api/agreements/:id/renew': { as: 'homeowner', params: id, body: renewSchema },
  'POST /api/agreements/:id/auto-renew': { as: 'homeowner', params: id, body: autoRenewSchema },
  'POST /api/agreements/:id/card': { as: 'homeowner', params: id },
  'POST /api/agreements/:id/manual-renewal': { as: 'office', params: id, body: manualRenewalSchema },
  'POST /api/agreements/:id/change-tier': { as: 'office', params: id, body: changeTierSchema },
  'POST /api/agreements/:id/cancel': { as: 'office', params: id, body: cancelAgreementSchema },
  'GET /api/invoices': { as: 'homeowner', query: invoiceListQuerySchema },
  'POST /api/invoices': { as: 'office', body: createInvoiceSchema },
  'POST /api/invoices/checkout-return': { as: 'homeowner', body: checkoutReturnSchema },
  'GET /api/invoices/:id': { as: 'homeowner', params: id },
  'GET /api/invoices/:id/pdf': { as: 'homeowner', params: id },
  'POST /api/invoices/:id/checkout': { as: 'homeowner', params: id, body: checkoutSchema },
  'POST /api/invoices/:id/issue': { as: 'office', params: id },
  'POST /api/invoices/:id/void': { as: 'office', params: id },
  'POST /api/invoices/:id/payments': { as: 'office', params: id, body: offlinePaymentSchema },
  'POST /api/invoices/:id/refunds': { as: 'office', params: id, body: refundSchema },
  'GET /api/renewals': { as: 'office', query: renewalQuerySchema },
  'GET /api/renewals/export.csv': { as: 'office', query: renewalQuerySchema },
  'POST /api/renewals/notices': { as: 'office', body: sendNoticesSchema },
  'GET /api/reminders/preview': { as: 'office', query: reminderPreviewQuerySchema },
  'GET /api/reminders/campaigns': { as: 'office' },
  'POST /api/reminders/campaigns': { as: 'office', body: createCampaignSchema },
  'GET /api/reminders/campaigns/:id': { as: 'office', params: id },
  'GET /api/settings/company': { as: 'owner' },
  'PUT /api/settings/company': { as: 'owner', body: companySettingsSchema },
  'GET /api/session': { as: 'anonymous' },
  'POST /api/auth/staff/sign-in': { as: 'anonymous', body: staffSignInSchema },
  'POST /api/auth/link': { as: 'anonymous', body: linkRequestSchema },
  'POST /api/auth/link/confirm': { as: 'anonymous', body: linkConfirmSchema },
  'POST /api/auth/password/forgot': { as: 'anonymous', body: forgotPasswordSchema },
  'POST /api/auth/password/set': { as: 'anonymous', body: setPasswordSchema },
  'POST /api/auth/sign-out': { as: 'homeowner' },
  'POST /api/auth/sign-out-everywhere': { as: 'homeowner' },
  'POST /api/auth/household-invitations': { as: 'office', body: householdInviteSchema },
  'GET /api/auth/staff': { as: 'owner' },
  'POST /api/auth/staff/invite': { as: 'owner', body: staffInviteSchema },
  'PATCH /api/auth/staff/:id': { as: 'owner', params: id, body: staffUpdateSchema },
  'POST /api/auth/staff/:id/sign-out-everywhere': { as: 'owner', params: id },
  'GET /api/audit': { as: 'owner', query: auditQuerySchema },
  'GET /api/field/visits/today': { as: 'technician' },
  'GET /api/field/visits/:id': { as: 'technician', params: id, query: seasonQuery },
  'PUT /api/field/visits/:id/readings': { as: 'technician', params: id, body: saveReadingsSchema },
  'PUT /api/field/visits/:id/checklist': { as: 'technician', params: id, body: saveChecklistSchema },
  'PUT /api/field/visits/:id/troubleshooting': { as: 'technician', params: id, body: troubleshootingSchema },
  'PUT /api/field/visits/:id/notes': { as: 'technician', params: id, body: visitNotesSchema },
  'POST /api/field/visits/:id/complete': { as: 'technician', params: id, body: completeVisitSchema },
  'GET /api/portal/readings/properties/:propertyId': { as: 'homeowner', params: ids('propertyId') },
  'GET /api/portal/visit-summaries/:id': { as: 'homeowner', params: id },
  'GET /api/booking/options': { as: 'homeowner', query: customerQuery },
  'GET /api/booking/windows': { as: 'homeowner', query: windowsQuerySchema },
  'GET /api/booking/visits': { as: 'homeowner', query: customerQuery },
  'POST /api/booking/visits': { as: 'homeowner', body: bookVisitSchema },
  'GET /api/booking/visits/:id': { as: 'homeowner', params: id },
  'POST /api/booking/visits/:id/reschedule': { as: 'homeowner', params: id, body: rescheduleSchema },
  'POST /api/booking/visits/:id/cancel': { as: 'homeowner', params: id, body: cancelSchema },
  'GET /api/dispatch/board': { as: 'office', query: boardQuerySchema },
  'GET /api/dispatch/households': { as: 'office', query: householdQuery },
  'POST /api/dispatch/visits/:id/assign': { as: 'office', params: id, body: assignSchema },
  'POST /api/dispatch/visits/:id/status': { as: 'office', params: id, body: statusChangeSchema },
  'GET /api/dispatch/visits/:id/events': { as: 'office', params: id },
  'POST /api/dispatch/time-off': { as: 'office', body: timeOffSchema },
  'DELETE /api/dispatch/time-off/:id': { as: 'office', params: id },
  'GET /api/schedule/week': { as: 'office', query: weekQuery },
  'POST /api/schedule/feed-token': { as: 'technician' },
  'DELETE /api/schedule/feed-token': { as: 'technician' },
  'GET /api/schedule/feed/:file': { as: 'anonymous', params: feedParam },
  'GET /api/customers': { as: 'office', query: customerListQuerySchema },
  'GET /api/customers/export.csv': { as: 'office', query: customerListQuerySchema },
  'POST /api/customers': { as: 'office', body: customerCreateSchema },
  'GET /api/customers/:id': { as: 'office', params: id },
  'PATCH /api/customers/:id': { as: 'office', params: id, body: customerUpdateSchema },
  'POST /api/customers/:id/archive': { as: 'office', params: id },
  'POST /api/customers/:id/restore': { as: 'office', params: id },
  'POST /api/customers/:id/merge': { as: 'office', params: id, body: mergeSchema },
  'POST /api/customers/:id/contacts': { as: 'office', params: id, body: contactInputSchema },
  'PUT /api/customers/:id/contacts/:contactId': { as: 'office', params: ids('id', 'contactId'), body: contactInputSchema },
  'DELETE /api/customers/:id/contacts/:contactId': { as: 'office', params: ids('id', 'contactId') },
  'POST /api/customers/:id/notes': { as: 'office', params: id, body: noteInputSchema },
  'POST /api/customers/:id/properties': { as: 'office', params: id, body: propertyInputSchema },
  'GET /api/properties/:id': { as: 'office', params: id },
  'PATCH /api/properties/:id': { as: 'office', params: id, body: propertyUpdateSchema },
  'POST /api/properties/:id/archive': { as: 'office', params: id },
  'POST /api/properties/:id/restore': { as: 'office', params: id },
  'GET /api/equipment': { as: 'technician', query: propertyRef },
  'POST /api/equipment': { as: 'technician', body: propertyRef.and(equipmentInputSchema) },
  'GET /api/equipment/:id': { as: 'technician', params: id },
  'PATCH /api/equipment/:id': { as: 'technician', params: id, body: equipmentUpdateSchema },
  'POST /api/equipment/:id/archive': { as: 'office', params: id },
  'POST /api/equipment/:id/restore': { as: 'office', params: id },
  'POST /api/files': { as: 'homeowner', body: uploadTargetSchema },
  'GET /api/files/:id': { as: 'homeowner', params: id, query: fileQuery },
  'GET /api/files/:id/thumb': { as: 'homeowner', params: id },
  'POST /api/files/:id/archive': { as: 'technician', params: id },
  'POST /api/imports/preview': { as: 'office', body: mappingField },
  'POST /api/imports/check': { as: 'office', body: mappingField },
  'POST /api/imports/run': { as: 'office', body: mappingField },
  'GET /api/my-home': { as: 'homeowner' },
  'PATCH /api/my-home/contact': { as: 'homeowner', body: homeContactSchema },
  'PATCH /api/my-home/properties/:id': { as: 'homeowner', params: id, body: homeAccessSchema },
  'POST /api/my-home/notes': { as: 'homeowner', body: homeNoteSchema },
};
