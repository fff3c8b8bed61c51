import { Router } from 'express';
import * as z from 'zod';
import { audienceQuerySchema, campaignActionSchema, createCampaignSchema, deliveryPageQuerySchema } from '../../shared/schemas/campaigns';
import type { AppDeps } from '../deps';
import { currentUser, requireRole } from '../auth/access';
import { parse } from '../http/errors';
import { campaignRecipients, householdReminders } from './delivery-log';
import { actOnCampaign, campaignSummary, createCampaign, deliveryLog, listCampaigns, previewMessages, previewReminders } from './campaigns.service';

const idParams = z.object({ id: z.uuid({ message: 'Campaign id is not valid.' }) });
export const previewPageQuery = z.object({ after: z.uuid({ message: 'After is a household id.' }).optional() });
export const householdParams = z.object({ customerId: z.uuid({ message: 'Customer id is not valid.' }) });
export const deliveryLogQuery = z.object({ customerId: z.uuid({ message: 'Customer id is not valid.' }).optional() });

function filterOf(q: z.infer<typeof audienceQuerySchema>) {
  const { kind, ...rest } = q;
  return { kind, filter: Object.fromEntries(Object.entries(rest).filter(([, v]) => v !== undefined)) };
}

// Seasonal reminders are office work: office staff and the owner only.
export function campaignRoutes(deps: AppDeps): Router {
  const router = Router({ caseSensitive: true, strict: true });
  router.use(requireRole('office', 'owner'));

  router.get('/preview', async (req, res) => {
    const { kind, filter } = filterOf(parse(audienceQuerySchema, req.query));
    const { after } = parse(previewPageQuery, { after: req.query['after'] });
    res.json(await previewReminders(deps, kind, filter, after ?? null));
  });

  router.get('/preview/messages', async (req, res) => {
    const { kind, filter } = filterOf(parse(audienceQuerySchema, req.query));
    res.json({ messages: await previewMessages(deps, kind, filter) });
  });

  router.get('/campaigns', async (_req, res) => {
    res.json({ campaigns: await listCampaigns(deps) });
  });

  router.post('/campaigns', async (req, res) => {
    res.status(201).json(await createCampaign(deps, currentUser(req), parse(createCampaignSchema, req.body)));
  });

  router.get('/campaigns/:id', async (req, res) => {
    const { id } = parse(idParams, req.params);
    res.json(await campaignSummary(deps, id));
  });

  router.post('/campaigns/:id/actions', async (req, res) => {
    const { id } = parse(idParams, req.params);
    const { action } = parse(campaignActionSchema, req.body);
    res.json(await actOnCampaign(deps, id, action));
  });

  router.get('/campaigns/:id/deliveries', async (req, res) => {
    const { id } = parse(idParams, req.params);
    const { customerId } = parse(deliveryLogQuery, req.query);
    res.json({ deliveries: await deliveryLog(deps, id, customerId) });
  });

  // Each household in the campaign and what became of its message, a keyset page at a time.
  router.get('/campaigns/:id/recipients', async (req, res) => {
    const { id } = parse(idParams, req.params);
    res.json(await campaignRecipients(deps, id, parse(deliveryPageQuerySchema, req.query)));
  });

  // The reminders one household was sent, newest first (staff see every household).
  router.get('/households/:customerId/sends', async (req, res) => {
    const { customerId } = parse(householdParams, req.params);
    res.json(await householdReminders(deps, customerId, parse(deliveryPageQuerySchema, req.query)));
  });

  return router;
}
