import { Router, type Response } from 'express';
import * as z from 'zod';
import { bookVisitSchema, cancelSchema, rescheduleSchema, windowsQuerySchema, type WindowFullBody } from '../../shared/schemas/booking';
import type { AppDeps } from '../deps';
import { currentUser, requireRole } from '../auth/access';
import { parse } from '../http/errors';
import { assertDatesWithin, BOOKING_RANGE } from '../http/ranges';
import { authoriseVisit, bookingOptions, bookVisit, windowsFor, WindowFullError } from './booking.service';
import { myVisits, visitDetail } from './my-visits';
import { cancelVisit, rescheduleVisit } from './visit-changes';

export const idParam = z.object({ id: z.uuid({ message: 'must be a visit id' }) });
export const customerQuery = z.object({ customerId: z.uuid({ message: 'must be a household id' }).optional() });

/** The one error shape, plus the next free windows so the caller can pick again at once. */
async function orNextWindows(res: Response, work: () => Promise<unknown>, status = 200): Promise<void> {
  try {
    res.status(status).json(await work());
  } catch (err) {
    if (!(err instanceof WindowFullError)) throw err;
    const body: WindowFullBody = { error: { code: 'window_full', message: err.message }, alternatives: err.alternatives };
    res.status(409).json(body);
  }
}

// Visit requests from the portal, and the office booking for a caller on the phone.
export function bookingRoutes(deps: AppDeps): Router {
  const router = Router({ caseSensitive: true, strict: true });
  const bookers = requireRole('homeowner', 'office', 'owner');

  router.get('/options', bookers, async (req, res) => {
    const { customerId } = parse(customerQuery, req.query);
    res.json(await bookingOptions(deps, currentUser(req), customerId));
  });

  router.get('/windows', bookers, async (req, res) => {
    const q = parse(windowsQuerySchema, req.query);
    assertDatesWithin(deps.clock(), BOOKING_RANGE, { from: q.from });
    res.setHeader('Cache-Control', 'no-store');
    res.json(await windowsFor(deps, currentUser(req), q));
  });

  router.get('/visits', bookers, async (req, res) => {
    const { customerId } = parse(customerQuery, req.query);
    res.json({ visits: await myVisits(deps, currentUser(req), customerId) });
  });

  router.post('/visits', bookers, async (req, res) => {
    const body = parse(bookVisitSchema, req.body);
    assertDatesWithin(deps.clock(), BOOKING_RANGE, { windowStart: body.windowStart });
    await orNextWindows(res, async () => ({ visit: await bookVisit(deps, currentUser(req), body) }), 201);
  });

  router.get('/visits/:id', requireRole('homeowner', 'technician', 'office', 'owner'), async (req, res) => {
    const { id } = parse(idParam, req.params);
    res.json({ visit: await visitDetail(deps, currentUser(req), id) });
  });

  router.post('/visits/:id/reschedule', bookers, async (req, res) => {
    const { id } = parse(idParam, req.params);
    await authoriseVisit(deps, currentUser(req), id);
    const body = parse(rescheduleSchema, req.body);
    assertDatesWithin(deps.clock(), BOOKING_RANGE, { windowStart: body.windowStart });
    await orNextWindows(res, async () => ({ visit: await rescheduleVisit(deps, currentUser(req), id, body) }));
  });

  router.post('/visits/:id/cancel', bookers, async (req, res) => {
    const { id } = parse(idParam, req.params);
    await authoriseVisit(deps, currentUser(req), id);
    const body = parse(cancelSchema, req.body ?? {});
    res.json({ visit: await cancelVisit(deps, currentUser(req), id, body) });
  });

  return router;
}
