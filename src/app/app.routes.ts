import { Routes } from '@angular/router';
import { Home } from './core/home';
import { NotFound } from './core/not-found';

export const routes: Routes = [
  { path: '', pathMatch: 'full', component: Home, title: 'Seasonwell' },
  { path: 'portal', loadChildren: () => import('./portal/portal.routes').then((m) => m.PORTAL_ROUTES) },
  { path: 'office', loadChildren: () => import('./office/office.routes').then((m) => m.OFFICE_ROUTES) },
  { path: 'field', loadChildren: () => import('./field/field.routes').then((m) => m.FIELD_ROUTES) },
  { path: 'admin', loadChildren: () => import('./admin/admin.routes').then((m) => m.ADMIN_ROUTES) },
  { path: '**', component: NotFound, title: 'Page not found · Seasonwell' },
];
