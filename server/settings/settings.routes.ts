import { Router } from 'express';
import { companySettingsSchema } from '../../shared/schemas/settings';
import type { AppDeps } from '../deps';
import { currentUser, requireRole } from '../auth/access';
import { parse } from '../http/errors';
import { getCompanySettings, updateCompanySettings } from './settings.service';

// Company details, hours and booking rules: the owner's alone.
export function settingsRoutes(deps: AppDeps): Router {
  const router = Router({ caseSensitive: true, strict: true });
  router.use(requireRole('owner'));
  router.get('/company', async (_req, res) => {
    res.json(await getCompanySettings(deps));
  });
  router.put('/company', async (req, res) => {
    const next = parse(companySettingsSchema, req.body);
    res.json(await updateCompanySettings(deps, currentUser(req).id, next));
  });
  return router;
}
