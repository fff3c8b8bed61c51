import { Routes } from '@angular/router';
import { provideCharts, withDefaultRegisterables } from 'ng2-charts';
import { PortalHome } from './portal-home';

export const PORTAL_ROUTES: Routes = [
  { path: '', component: PortalHome, title: 'Your home · Seasonwell' },
  { path: 'visits/:id', loadComponent: () => import('./visit-summary/visit-summary').then((m) => m.VisitSummary), providers: [provideCharts(withDefaultRegisterables())], title: 'Visit summary · Seasonwell' },
];
