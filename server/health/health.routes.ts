import { Router } from 'express';
import type { AppDeps } from '../app';
import { databaseIsUp } from './health.service';

export function healthRoutes(deps: AppDeps): Router {
  const router = Router({ caseSensitive: true, strict: true });
  router.get('/', async (_req, res) => {
    const up = await databaseIsUp(deps.database);
    res.status(up ? 200 : 503).json({ status: up ? 'ok' : 'unavailable', database: up ? 'up' : 'down', time: deps.clock().toISOString() });
  });
  return router;
}
