import { Router } from 'express';
import * as z from 'zod';
import { createPlanSchema, planActiveSchema, planTermsSchema } from '../../shared/schemas/plans';
import type { AppDeps } from '../deps';
import { currentUser, isStaffOffice, requireRole, requireUser } from '../auth/access';
import { parse } from '../http/errors';
import { createPlan, listPlans, planVersionsOf, setPlanActive, updatePlan } from './plans.service';

export const idParam = z.object({ id: z.uuid('That plan was not found.') });

export function planRoutes(deps: AppDeps): Router {
  const router = Router({ caseSensitive: true, strict: true });
  router.get('/', requireUser, async (req, res) => {
    const user = currentUser(req);
    const all = req.query['all'] === '1' && isStaffOffice(user);
    res.json({ plans: await listPlans(deps, { includeInactive: all }) });
  });
  router.get('/:id/versions', requireRole('owner', 'office'), async (req, res) => {
    const { id } = parse(idParam, req.params);
    res.json({ versions: await planVersionsOf(deps, id) });
  });
  router.post('/', requireRole('owner'), async (req, res) => {
    res.status(201).json(await createPlan(deps, parse(createPlanSchema, req.body)));
  });
  router.put('/:id', requireRole('owner'), async (req, res) => {
    const { id } = parse(idParam, req.params);
    res.json(await updatePlan(deps, id, parse(planTermsSchema, req.body)));
  });
  router.patch('/:id', requireRole('owner'), async (req, res) => {
    const { id } = parse(idParam, req.params);
    res.json(await setPlanActive(deps, id, parse(planActiveSchema, req.body).active));
  });
  return router;
}
