import { Router } from 'express';
import { renewalQuerySchema, sendNoticesSchema } from '../../shared/schemas/plans';
import type { AppDeps } from '../deps';
import { currentUser, requireRole } from '../auth/access';
import { parse } from '../http/errors';
import { queueRenewalNotices } from './renewal-engine';
import { renewalBoard, renewalCsv } from './renewals.service';

export function renewalRoutes(deps: AppDeps): Router {
  const router = Router({ caseSensitive: true, strict: true });
  router.use(requireRole('office', 'owner'));
  router.get('/', async (req, res) => {
    res.json(await renewalBoard(deps, parse(renewalQuerySchema, req.query).view));
  });
  router.get('/export.csv', async (req, res) => {
    const { view } = parse(renewalQuerySchema, req.query);
    res.type('text/csv').setHeader('Content-Disposition', `attachment; filename="renewals-${view}.csv"`);
    res.send(await renewalCsv(deps, view));
  });
  router.post('/notices', async (req, res) => {
    const { agreementIds } = parse(sendNoticesSchema, req.body);
    res.status(202).json(await queueRenewalNotices(deps, agreementIds, currentUser(req).id));
  });
  return router;
}
