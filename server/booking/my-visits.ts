import { and, eq, gte } from 'drizzle-orm';
import type { VisitView } from '../../shared/schemas/booking';
import type { SessionUser } from '../../shared/schemas/session';
import { assertCustomerAccess } from '../auth/access';
import { visits } from '../db/schema';
import type { AppDeps } from '../deps';
import { AppError } from '../http/errors';
import { visitFor } from './booking.service';
import { loadCompanySettings } from './scheduling-input';
import { toView, visitRows } from './visit-views';

// A household's visits as the homeowner and the office read them: the last 90 days and everything ahead.

export async function myVisits(deps: Pick<AppDeps, 'database' | 'clock'>, user: SessionUser, customerId: string | undefined): Promise<VisitView[]> {
  const { db } = deps.database;
  const target = user.role === 'homeowner' ? user.customerId : customerId;
  if (!target) throw new AppError(422, 'validation_failed', 'Please choose the household.', { customerId: 'is required' });
  await assertCustomerAccess(db, user, target);
  const c = await loadCompanySettings(db);
  const now = deps.clock();
  const since = new Date(now.getTime() - 90 * 86_400_000);
  const rows = await visitRows(db, and(eq(visits.customerId, target), gte(visits.windowEnd, since)), 'desc');
  return rows.map((r) => toView(r, { timeZone: c.timeZone, cancelCutoffHours: c.cancelCutoffHours, phone: c.phone, now }));
}

export async function visitDetail(deps: Pick<AppDeps, 'database' | 'clock'>, user: SessionUser, id: string): Promise<VisitView> {
  const { db } = deps.database;
  const row = await visitFor(db, user, id);
  const c = await loadCompanySettings(db);
  return toView(row, { timeZone: c.timeZone, cancelCutoffHours: c.cancelCutoffHours, phone: c.phone, now: deps.clock() });
}
