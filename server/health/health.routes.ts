import { Router } from 'express';
import type { AppDeps } from '../deps';
import { databaseIsUp } from './health.service';

export function healthRoutes(deps: AppDeps): Router {
  const router = Router();
  router.get('/', async (_req, res) => {
    const up = await databaseIsUp(deps.database);
    res.status(up ? 200 : 503).json({ status: up ? 'ok' : 'unavailable', database: up ? 'up' : 'down', time: deps.clock().toISOString() });
  });
  return router;
}
