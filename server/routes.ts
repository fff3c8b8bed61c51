import type { Router } from 'express';
import type { AppDeps } from './app';
import { auditRoutes } from './audit/audit.routes';
import { authRoutes } from './auth/auth.routes';
import { sessionRoutes } from './auth/session.routes';
import { healthRoutes } from './health/health.routes';

export interface ApiRouter {
  path: string;
  build: (deps: AppDeps) => Router;
  /** Mounted before the JSON body parser (webhooks need the raw body). */
  rawBody?: boolean;
}

// Every API router, one line each. The access-control test walks all of them.
export const apiRouters: ApiRouter[] = [
  { path: '/api/health', build: healthRoutes },
  { path: '/api/session', build: sessionRoutes },
  { path: '/api/auth', build: authRoutes },
  { path: '/api/audit', build: auditRoutes },
];
