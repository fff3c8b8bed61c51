import { Routes } from '@angular/router';
import { OfficeHome } from './office-home';

export const OFFICE_ROUTES: Routes = [
  { path: '', component: OfficeHome, title: 'Office · Seasonwell' },
  { path: 'invite', loadComponent: () => import('../core/auth/household-invite').then((m) => m.HouseholdInvite), title: 'Invite a household · Seasonwell' },
  { path: 'reminders', loadComponent: () => import('./reminders/reminders').then((m) => m.Reminders), title: 'Reminders · Seasonwell' },
];
