import { Routes } from '@angular/router';

export const ADMIN_ROUTES: Routes = [
  { path: '', loadComponent: () => import('./admin-home').then((m) => m.AdminHome), title: 'Settings · Seasonwell' },
  {
    path: 'company',
    loadComponent: () => import('./company/company-settings').then((m) => m.CompanySettingsPage),
    data: { section: 'company' },
    title: 'Company details · Seasonwell',
  },
  {
    path: 'hours',
    loadComponent: () => import('./company/company-settings').then((m) => m.CompanySettingsPage),
    data: { section: 'hours' },
    title: 'Hours and booking rules · Seasonwell',
  },
  { path: 'plans', loadComponent: () => import('./plans/plan-admin').then((m) => m.PlanAdmin), title: 'Plans · Seasonwell' },
  { path: 'staff', loadComponent: () => import('./staff/staff-list').then((m) => m.StaffList), title: 'Staff · Seasonwell' },
  { path: 'audit', loadComponent: () => import('./audit/audit-log').then((m) => m.AuditLog), title: 'Access log · Seasonwell' },
  { path: 'price-book', loadComponent: () => import('./pricebook/price-book').then((m) => m.PriceBook), title: 'Price book · Seasonwell' },
  { path: 'price-book/import', loadComponent: () => import('./pricebook/price-book-import').then((m) => m.PriceBookImport), title: 'Import the price book · Seasonwell' },
];
