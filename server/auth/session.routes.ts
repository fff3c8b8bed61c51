import type {} from '../auth/access';
import { Router } from 'express';
import type { AppDeps } from '../app';

// Who is signed in, for the client's navigation. Sign-in itself lives in auth.routes.ts.
export function sessionRoutes(_deps: AppDeps): Router {
  const router = Router();
  router.get('/', (req, res) => {
    res.json({ user: req.user ?? null });
  });
  return router;
}
