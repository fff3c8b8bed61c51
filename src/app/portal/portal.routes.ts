import { Routes } from '@angular/router';

export const PORTAL_ROUTES: Routes = [
  { path: '', loadComponent: () => import('./start/portal-home').then((m) => m.PortalHome), title: 'Your home · Seasonwell' },
  { path: 'plan', loadComponent: () => import('./plan/my-plan').then((m) => m.MyPlan), title: 'My plan · Seasonwell' },
  { path: 'invoices', loadComponent: () => import('./invoices/my-invoices').then((m) => m.MyInvoices), title: 'Invoices · Seasonwell' },
  { path: 'invoices/:id', loadComponent: () => import('./invoices/invoice-detail').then((m) => m.InvoiceDetail), title: 'Invoice · Seasonwell' },
  { path: 'quotes', loadComponent: () => import('./quotes/my-quotes').then((m) => m.MyQuotes), title: 'Quotes · Seasonwell' },
  { path: 'quotes/:id', loadComponent: () => import('./quotes/quote-page').then((m) => m.QuotePage), title: 'Quote · Seasonwell' },
  { path: 'booking', loadComponent: () => import('./booking/visit-request').then((m) => m.VisitRequest), title: 'Request a visit · Seasonwell' },
  { path: 'booking/visits', loadComponent: () => import('./booking/my-visits').then((m) => m.MyVisits), title: 'Your visits · Seasonwell' },
  { path: 'booking/visits/:id', loadComponent: () => import('./booking/visit-detail').then((m) => m.VisitDetail), title: 'Your visit · Seasonwell' },
  { path: 'visits/:id', loadComponent: () => import('./visit-summary/visit-summary').then((m) => m.VisitSummary), title: 'Visit summary · Seasonwell' },
  { path: 'reminders', loadComponent: () => import('./reminders/reminder-preferences').then((m) => m.ReminderPreferences), title: 'Reminders · Seasonwell' },
  { path: 'home', loadComponent: () => import('./home/my-home').then((m) => m.MyHome), title: 'My home · Seasonwell' },
];
