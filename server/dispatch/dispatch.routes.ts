import { Router } from 'express';
import * as z from 'zod';
import { assignSchema, boardQuerySchema, statusChangeSchema, timeOffSchema } from '../../shared/schemas/booking';
import type { AppDeps } from '../deps';
import { currentUser, requireRole } from '../auth/access';
import { parse } from '../http/errors';
import { assertDatesWithin, OFFICE_RANGE } from '../http/ranges';
import { addTimeOff, assignVisit, keptBoard, changeStatus, findHouseholds, removeTimeOff, visitHistory } from './dispatch.service';

export const idParam = z.object({ id: z.uuid({ message: 'must be an id' }) });
export const householdQuery = z.object({ q: z.string().trim().min(2, 'type at least 2 characters').max(80) });

// The office's dispatch board: visits by technician, the unassigned queue, assignments and statuses.
export function dispatchRoutes(deps: AppDeps): Router {
  const router = Router({ caseSensitive: true, strict: true });
  const office = requireRole('office', 'owner');

  router.get('/board', office, async (req, res) => {
    res.setHeader('Cache-Control', 'no-store');
    const q = parse(boardQuerySchema, req.query);
    assertDatesWithin(deps.clock(), OFFICE_RANGE, { from: q.from });
    const answer = await keptBoard(deps, q);
    // A kept board is compressed once, not for every office screen that asks for it.
    res.type('json').vary('Accept-Encoding');
    if (req.acceptsEncodings('gzip', 'identity') === 'gzip') res.setHeader('Content-Encoding', 'gzip').send(answer.gzipped());
    else res.send(answer.body);
  });

  router.get('/households', office, async (req, res) => {
    const { q } = parse(householdQuery, req.query);
    res.json({ households: await findHouseholds(deps, q) });
  });

  router.post('/visits/:id/assign', office, async (req, res) => {
    const { id } = parse(idParam, req.params);
    const body = parse(assignSchema, req.body);
    assertDatesWithin(deps.clock(), OFFICE_RANGE, { startsAt: body.startsAt });
    res.json({ visit: await assignVisit(deps, currentUser(req), id, body) });
  });

  // Technicians mark their own visits on the way, on site, done or no-show.
  router.post('/visits/:id/status', requireRole('technician', 'office', 'owner'), async (req, res) => {
    const { id } = parse(idParam, req.params);
    res.json({ visit: await changeStatus(deps, currentUser(req), id, parse(statusChangeSchema, req.body)) });
  });

  router.get('/visits/:id/events', office, async (req, res) => {
    const { id } = parse(idParam, req.params);
    res.json({ events: await visitHistory(deps, id) });
  });

  router.post('/time-off', office, async (req, res) => {
    const body = parse(timeOffSchema, req.body);
    assertDatesWithin(deps.clock(), OFFICE_RANGE, { startsAt: body.startsAt, endsAt: body.endsAt });
    res.status(201).json(await addTimeOff(deps, body));
  });

  router.delete('/time-off/:id', office, async (req, res) => {
    const { id } = parse(idParam, req.params);
    await removeTimeOff(deps, id);
    res.status(204).end();
  });

  return router;
}
