import { Router } from 'express';
import * as z from 'zod';
import { weekQuerySchema } from '../../shared/schemas/booking';
import type { AppDeps } from '../deps';
import { currentUser, requireRole } from '../auth/access';
import { parse } from '../http/errors';
import { assertDatesWithin, OFFICE_RANGE } from '../http/ranges';
import { feedFor, issueFeedToken, revokeFeedToken, weekSchedule } from './schedule.service';

export const weekQuery = weekQuerySchema.extend({ technicianId: z.uuid({ message: 'must be a technician id' }).optional() });
export const feedParam = z.object({ file: z.string().regex(/^[A-Za-z0-9_-]{20,64}\.ics$/, 'not a calendar link') });

// The technician's week, and the private .ics feed their phone calendar subscribes to.
export function scheduleRoutes(deps: AppDeps): Router {
  const router = Router({ caseSensitive: true, strict: true });

  router.get('/week', requireRole('technician', 'office', 'owner'), async (req, res) => {
    const { start, technicianId } = parse(weekQuery, req.query);
    assertDatesWithin(deps.clock(), OFFICE_RANGE, { start });
    res.json(await weekSchedule(deps, currentUser(req), start, technicianId));
  });

  router.post('/feed-token', requireRole('technician'), async (req, res) => {
    res.status(201).json(await issueFeedToken(deps, currentUser(req)));
  });

  router.delete('/feed-token', requireRole('technician'), async (req, res) => {
    await revokeFeedToken(deps, currentUser(req));
    res.status(204).end();
  });

  // No session: calendar apps fetch this with only the secret link.
  router.get('/feed/:file', async (req, res) => {
    const { file } = parse(feedParam, req.params);
    const ics = await feedFor(deps, file.slice(0, -4));
    res.setHeader('Content-Type', 'text/calendar; charset=utf-8');
    res.setHeader('Cache-Control', 'private, max-age=300');
    res.send(ics);
  });

  return router;
}
