import { Router } from 'express';
import * as z from 'zod';
import { autoRenewSchema, cancelAgreementSchema, changeTierSchema, enrollSchema, manualRenewalSchema, renewSchema } from '../../shared/schemas/plans';
import type { AppDeps } from '../deps';
import { currentUser, requireRole, requireUser } from '../auth/access';
import { parse } from '../http/errors';
import { cancelAgreement, changeTier, enroll, manualRenewal, myAgreements, myProperties, readAgreement, renewOnline, setAutoRenew, updateCard } from './agreements.service';

export const idParam = z.object({ id: z.uuid('That agreement was not found.') });

export function agreementRoutes(deps: AppDeps): Router {
  const router = Router({ caseSensitive: true, strict: true });
  router.get('/mine', requireRole('homeowner'), async (req, res) => {
    const user = currentUser(req);
    res.json({ agreements: await myAgreements(deps, user), properties: await myProperties(deps, user) });
  });
  router.post('/enroll', requireRole('homeowner', 'office', 'owner'), async (req, res) => {
    res.status(201).json(await enroll(deps, currentUser(req), parse(enrollSchema, req.body)));
  });
  router.get('/:id', requireUser, async (req, res) => {
    res.json(await readAgreement(deps, currentUser(req), parse(idParam, req.params).id));
  });
  router.post('/:id/renew', requireRole('homeowner', 'office', 'owner'), async (req, res) => {
    const { autoRenew } = parse(renewSchema, req.body ?? {});
    res.json(await renewOnline(deps, currentUser(req), parse(idParam, req.params).id, autoRenew));
  });
  router.post('/:id/auto-renew', requireRole('homeowner', 'office', 'owner'), async (req, res) => {
    const { enabled } = parse(autoRenewSchema, req.body);
    res.json(await setAutoRenew(deps, currentUser(req), parse(idParam, req.params).id, enabled));
  });
  router.post('/:id/card', requireRole('homeowner'), async (req, res) => {
    res.json(await updateCard(deps, currentUser(req), parse(idParam, req.params).id));
  });
  router.post('/:id/manual-renewal', requireRole('office', 'owner'), async (req, res) => {
    res.json(await manualRenewal(deps, currentUser(req), parse(idParam, req.params).id, parse(manualRenewalSchema, req.body)));
  });
  router.post('/:id/change-tier', requireRole('office', 'owner'), async (req, res) => {
    res.json(await changeTier(deps, currentUser(req), parse(idParam, req.params).id, parse(changeTierSchema, req.body)));
  });
  router.post('/:id/cancel', requireRole('office', 'owner'), async (req, res) => {
    res.json(await cancelAgreement(deps, currentUser(req), parse(idParam, req.params).id, parse(cancelAgreementSchema, req.body ?? {}).reason));
  });
  return router;
}
