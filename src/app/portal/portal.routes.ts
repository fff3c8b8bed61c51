import { Routes } from '@angular/router';
import { PortalHome } from './portal-home';

export const PORTAL_ROUTES: Routes = [{ path: '', component: PortalHome, title: 'Your home · Seasonwell' }];
