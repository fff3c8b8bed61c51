import type {} from '../auth/access';
import { Router } from 'express';
import { companyLocale } from '../company/company';
import type { AppDeps } from '../deps';
import { issueCsrf } from './csrf';

// Who is signed in, for the client's navigation; also hands out the CSRF token cookie.
// Sign-in itself lives in auth.routes.ts.
export function sessionRoutes(deps: AppDeps): Router {
  const router = Router({ caseSensitive: true, strict: true });
  router.get('/', async (req, res) => {
    const csrfToken = issueCsrf(req, res, deps.config);
    const company = await companyLocale(deps.database.db);
    res.setHeader('Cache-Control', 'no-store');
    res.json({ user: req.user ?? null, company, csrfToken });
  });
  return router;
}
