import type {} from '../auth/access';
import { Router } from 'express';
import type { AppDeps } from '../deps';
import { issueCsrf } from './csrf';

// Who is signed in, for the client's navigation; also hands out the CSRF token cookie.
// Sign-in itself lives in auth.routes.ts.
export function sessionRoutes(deps: AppDeps): Router {
  const router = Router({ caseSensitive: true, strict: true });
  router.get('/', (req, res) => {
    const csrfToken = issueCsrf(req, res, deps.config);
    res.setHeader('Cache-Control', 'no-store');
    res.json({ user: req.user ?? null, csrfToken });
  });
  return router;
}
