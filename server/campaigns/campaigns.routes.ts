import { Router } from 'express';
import { z } from 'zod';
import { createCampaignSchema, reminderPreviewQuerySchema } from '../../shared/schemas/campaigns';
import type { AppDeps } from '../deps';
import { currentUser, requireRole } from '../auth/access';
import { parse } from '../http/errors';
import { campaignSummary, createCampaign, listCampaigns, previewReminders } from './campaigns.service';

// Seasonal reminders are office work: office staff and the owner only.
export function campaignRoutes(deps: AppDeps): Router {
  const router = Router({ caseSensitive: true, strict: true });
  router.use(requireRole('office', 'owner'));

  router.get('/preview', async (req, res) => {
    const { kind } = parse(reminderPreviewQuerySchema, req.query);
    res.json(await previewReminders(deps, kind));
  });

  router.get('/campaigns', async (_req, res) => {
    res.json({ campaigns: await listCampaigns(deps) });
  });

  router.post('/campaigns', async (req, res) => {
    const { kind, expectedCount } = parse(createCampaignSchema, req.body);
    res.status(201).json(await createCampaign(deps, currentUser(req), kind, expectedCount));
  });

  router.get('/campaigns/:id', async (req, res) => {
    const { id } = parse(z.object({ id: z.uuid({ message: 'Campaign id is not valid.' }) }), req.params);
    res.json(await campaignSummary(deps, id));
  });

  return router;
}
