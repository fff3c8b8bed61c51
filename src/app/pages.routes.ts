import { Routes } from '@angular/router';
import { roleGuard, signedInGuard } from './core/auth/guards';
import { NotFound } from './core/not-found';
import { provideIcons } from './ui/icons';

/** Every page but the start page, under one parent that registers the icon set. */
export const PAGE_ROUTES: Routes = [
  {
    path: '',
    providers: [provideIcons()],
    children: [
      { path: 'sign-in', pathMatch: 'full', loadComponent: () => import('./core/auth/sign-in').then((m) => m.SignIn), title: 'Sign in · Seasonwell' },
      { path: 'sign-in/confirm', loadComponent: () => import('./core/auth/link-confirm').then((m) => m.LinkConfirm), title: 'Confirm sign-in · Seasonwell' },
      { path: 'staff/sign-in', loadComponent: () => import('./core/auth/staff-sign-in').then((m) => m.StaffSignIn), title: 'Staff sign-in · Seasonwell' },
      { path: 'set-password', loadComponent: () => import('./core/auth/set-password').then((m) => m.SetPassword), title: 'Choose a password · Seasonwell' },
      { path: 'forgot-password', loadComponent: () => import('./core/auth/forgot-password').then((m) => m.ForgotPassword), title: 'Forgot password · Seasonwell' },
      { path: 'profile', canMatch: [signedInGuard], loadComponent: () => import('./core/profile/profile').then((m) => m.Profile), title: 'Profile · Seasonwell' },
      { path: 'portal', canMatch: [roleGuard('homeowner')], loadChildren: () => import('./portal/portal.routes').then((m) => m.PORTAL_ROUTES) },
      { path: 'office', canMatch: [roleGuard('office', 'owner')], loadChildren: () => import('./office/office.routes').then((m) => m.OFFICE_ROUTES) },
      { path: 'field', canMatch: [roleGuard('technician', 'owner')], loadChildren: () => import('./field/field.routes').then((m) => m.FIELD_ROUTES) },
      { path: 'admin', canMatch: [roleGuard('owner')], loadChildren: () => import('./admin/admin.routes').then((m) => m.ADMIN_ROUTES) },
      { path: '**', component: NotFound, title: 'Page not found · Seasonwell' },
    ],
  },
];
