import { Router } from 'express';
import * as z from 'zod';
import { completeVisitSchema, saveChecklistSchema, saveReadingsSchema, troubleshootingSchema, visitNotesSchema } from '../../shared/schemas/field';
import type { AppDeps } from '../deps';
import { currentUser, requireRole } from '../auth/access';
import { notFound, parse } from '../http/errors';
import { completeVisit, fieldVisit, saveChecklist, saveNotes, saveReadings, saveTroubleshooting, todayVisits } from './field.service';

const visitId = (raw: unknown): string => {
  const r = z.uuid().safeParse(raw);
  if (!r.success) throw notFound('That visit');
  return r.data;
};
export const seasonQuery = z.object({ season: z.enum(['cooling', 'heating']).optional() });

/** The technician's visit screen: today's list, one visit's page, and what is recorded on site. */
export function fieldRoutes(deps: AppDeps): Router {
  const router = Router({ caseSensitive: true, strict: true });
  router.use(requireRole('technician', 'owner'));

  router.get('/visits/today', async (req, res) => {
    res.json(await todayVisits(deps, currentUser(req)));
  });

  router.get('/visits/:id', async (req, res) => {
    const { season } = parse(seasonQuery, req.query);
    res.json(await fieldVisit(deps, currentUser(req), visitId(req.params.id), season));
  });

  router.put('/visits/:id/readings', async (req, res) => {
    const id = visitId(req.params.id);
    const body = parse(saveReadingsSchema, req.body);
    res.json(await saveReadings(deps, currentUser(req), id, body));
  });

  router.put('/visits/:id/checklist', async (req, res) => {
    const id = visitId(req.params.id);
    const body = parse(saveChecklistSchema, req.body);
    res.json({ checklist: await saveChecklist(deps, currentUser(req), id, body) });
  });

  router.put('/visits/:id/troubleshooting', async (req, res) => {
    const id = visitId(req.params.id);
    const body = parse(troubleshootingSchema, req.body);
    res.json(await saveTroubleshooting(deps, currentUser(req), id, body));
  });

  router.put('/visits/:id/notes', async (req, res) => {
    const id = visitId(req.params.id);
    const body = parse(visitNotesSchema, req.body);
    res.json(await saveNotes(deps, currentUser(req), id, body));
  });

  router.post('/visits/:id/complete', async (req, res) => {
    const id = visitId(req.params.id);
    const body = parse(completeVisitSchema, req.body);
    res.json(await completeVisit(deps, currentUser(req), id, body, req.log));
  });

  return router;
}
