import { Router } from 'express';
import { setTimeout as sleep } from 'node:timers/promises';
import type { AppDeps } from '../deps';
import { RETRY_AFTER_SECONDS } from '../http/errors';
import { databaseIsUp } from './health.service';

export function healthRoutes(deps: AppDeps): Router {
  const router = Router({ caseSensitive: true, strict: true });
  router.get('/', async (_req, res) => {
    const up = await databaseIsUp(deps.database);
    if (!up) res.setHeader('Retry-After', String(RETRY_AFTER_SECONDS));
    res.status(up ? 200 : 503).json({ status: up ? 'ok' : 'unavailable', database: up ? 'up' : 'down', time: deps.clock().toISOString() });
  });
  // Test runs only: a request that takes a while (and then touches the database), so the shutdown
  // test can stop the process while one is in flight.
  if (deps.config.NODE_ENV === 'test') {
    router.get('/slow', async (req, res) => {
      const ms = Math.min(Math.max(Number(req.query.ms) || 0, 0), 5000);
      await sleep(ms);
      const up = await databaseIsUp(deps.database);
      res.status(up ? 200 : 503).json({ waitedMs: ms, database: up ? 'up' : 'down' });
    });
  }
  return router;
}
