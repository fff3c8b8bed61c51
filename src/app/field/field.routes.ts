import { Routes } from '@angular/router';
import { TodayVisits } from './today/today-visits';
import { VisitPage } from './visit/visit-page';

export const FIELD_ROUTES: Routes = [
  { path: '', component: TodayVisits, title: "Today's visits · Seasonwell" },
  { path: 'visits/:id', component: VisitPage, title: 'Visit · Seasonwell' },
  { path: 'week', loadComponent: () => import('./schedule/week-schedule').then((m) => m.WeekSchedule), title: 'My week · Seasonwell' },
  { path: 'truck', loadComponent: () => import('./quotes/my-truck').then((m) => m.MyTruck), title: 'My truck · Seasonwell' },
];
