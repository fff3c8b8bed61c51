import { Router } from 'express';
import type { AppDeps } from '../deps';
import { requireRole } from '../auth/access';
import { parse } from '../http/errors';
import { auditQuerySchema } from '../../shared/schemas/auth';
import { listAuditEvents } from './audit.query';

// The owner reads who signed in, who failed, and who changed whose access.
export function auditRoutes(deps: AppDeps): Router {
  const router = Router({ caseSensitive: true, strict: true });
  router.get('/', requireRole('owner'), async (req, res) => {
    const q = parse(auditQuerySchema, req.query);
    res.json(await listAuditEvents(deps, q));
  });
  return router;
}
