import { Router } from 'express';
import * as z from 'zod';
import type { AppDeps } from '../deps';
import { currentUser, requireUser } from '../auth/access';
import { notFound } from '../http/errors';
import { homeownerVisitSummary, propertyReadings } from './portal-readings.service';

const uuidOr404 = (raw: unknown, what: string): string => {
  const r = z.uuid().safeParse(raw);
  if (!r.success) throw notFound(what);
  return r.data;
};

/** A home's readings history, for the chart on "My home". Ownership is checked in the service. */
export function portalReadingsRoutes(deps: AppDeps): Router {
  const router = Router({ caseSensitive: true, strict: true });
  router.use(requireUser);
  router.get('/properties/:propertyId', async (req, res) => {
    res.json(await propertyReadings(deps, currentUser(req), uuidOr404(req.params.propertyId, 'That home')));
  });
  return router;
}

/** A completed visit in plain words for its household. */
export function visitSummaryRoutes(deps: AppDeps): Router {
  const router = Router({ caseSensitive: true, strict: true });
  router.use(requireUser);
  router.get('/:id', async (req, res) => {
    res.json(await homeownerVisitSummary(deps, currentUser(req), uuidOr404(req.params.id, 'That visit')));
  });
  return router;
}
