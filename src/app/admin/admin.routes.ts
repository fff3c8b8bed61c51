import { Routes } from '@angular/router';
import { AdminHome } from './admin-home';

export const ADMIN_ROUTES: Routes = [{ path: '', component: AdminHome, title: 'Settings · Seasonwell' }];
