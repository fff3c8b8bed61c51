import { Routes } from '@angular/router';

export const OFFICE_ROUTES: Routes = [
  { path: '', loadComponent: () => import('./home/office-home').then((m) => m.OfficeHome), title: 'Office · Seasonwell' },
  { path: 'reports', loadComponent: () => import('./reports/reports-page').then((m) => m.ReportsPage), title: 'Reports · Seasonwell' },
  { path: 'renewals', loadComponent: () => import('./renewals/renewals').then((m) => m.Renewals), title: 'Renewals · Seasonwell' },
  { path: 'invoices', loadComponent: () => import('./invoices/office-invoices').then((m) => m.OfficeInvoices), title: 'Invoices · Seasonwell' },
  { path: 'invoices/:id', loadComponent: () => import('./invoices/office-invoice').then((m) => m.OfficeInvoice), title: 'Invoice · Seasonwell' },
  { path: 'invite', loadComponent: () => import('../core/auth/household-invite').then((m) => m.HouseholdInvite), title: 'Invite a household · Seasonwell' },
  { path: 'dispatch', loadComponent: () => import('./dispatch/dispatch-board').then((m) => m.DispatchBoard), title: 'Dispatch · Seasonwell' },
  { path: 'dispatch/book', loadComponent: () => import('./dispatch/caller-booking').then((m) => m.CallerBooking), title: 'Book for a caller · Seasonwell' },
  { path: 'reminders', loadComponent: () => import('./reminders/reminders').then((m) => m.Reminders), title: 'Reminders · Seasonwell' },
  { path: 'customers', loadComponent: () => import('./customers/customer-list').then((m) => m.CustomerList), title: 'Households · Seasonwell' },
  { path: 'customers/new', loadComponent: () => import('./customers/customer-form').then((m) => m.CustomerForm), title: 'New household · Seasonwell' },
  { path: 'customers/:id', loadComponent: () => import('./customers/customer-page').then((m) => m.CustomerPage), title: 'Household · Seasonwell' },
  { path: 'imports', loadComponent: () => import('./imports/customer-import').then((m) => m.CustomerImport), title: 'Import households · Seasonwell' },
  { path: 'quotes', loadComponent: () => import('./quotes/open-quotes').then((m) => m.OpenQuotes), title: 'Quotes · Seasonwell' },
  { path: 'stock', loadComponent: () => import('./stock/restock-list').then((m) => m.RestockList), title: 'Truck stock · Seasonwell' },
];
