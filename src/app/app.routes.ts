import { Routes } from '@angular/router';
import { Home } from './core/home';

// The start page is in the first chunk; every other page, with Material's icon registry, loads
// through pages.routes.ts, so the first load carries the router and the start page only.
export const routes: Routes = [
  { path: '', pathMatch: 'full', component: Home, title: 'Seasonwell' },
  { path: '', loadChildren: () => import('./pages.routes').then((m) => m.PAGE_ROUTES) },
];
