import { Routes } from '@angular/router';
import { FieldHome } from './field-home';

export const FIELD_ROUTES: Routes = [{ path: '', component: FieldHome, title: 'Today · Seasonwell' }];
