import { Router } from 'express';
import type { AppDeps } from '../deps';
import { requireRole } from '../auth/access';
import { officeHome } from './office-home.service';

/** The office's first screen: counts, each matching the filtered table it links to. */
export function officeHomeRoutes(deps: AppDeps): Router {
  const router = Router({ caseSensitive: true, strict: true });
  router.use(requireRole('office', 'owner'));
  router.get('/', async (_req, res) => {
    res.json(await officeHome(deps));
  });
  return router;
}
