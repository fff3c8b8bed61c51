import { Routes } from '@angular/router';

export const FIELD_ROUTES: Routes = [
  { path: '', loadComponent: () => import('./today/today-visits').then((m) => m.TodayVisits), title: "Today's visits · Seasonwell" },
  { path: 'visits/:id', loadComponent: () => import('./visit/visit-page').then((m) => m.VisitPage), title: 'Visit · Seasonwell' },
  { path: 'week', loadComponent: () => import('./schedule/week-schedule').then((m) => m.WeekSchedule), title: 'My week · Seasonwell' },
  { path: 'truck', loadComponent: () => import('./quotes/my-truck').then((m) => m.MyTruck), title: 'My truck · Seasonwell' },
];
