import { and, desc, eq, inArray, isNull, sql } from 'drizzle-orm';
import { DateTime } from 'luxon';
import { dueItems, type HomeRecords } from '../../shared/reminders';
import type { RenewalNotice } from '../../shared/renewals';
import type { MyDueItem, MyReminders, ReminderPreferences } from '../../shared/schemas/campaigns';
import type { SessionUser } from '../../shared/schemas/session';
import type { AppDeps } from '../deps';
import { agreements, equipment, filterChanges, householdReminderSettings, mailSuppressions, planVersions, properties, renewalNotices, visits, customers } from '../db/schema';
import { companyRow, localDate } from '../company/company';
import { notFound } from '../http/errors';

type Deps = Pick<AppDeps, 'database' | 'clock'>;

function household(user: SessionUser): string {
  if (!user.customerId) throw notFound('Your household');
  return user.customerId;
}

async function preferences(deps: Deps, customerId: string): Promise<ReminderPreferences> {
  const [row] = await deps.database.db.select().from(householdReminderSettings).where(eq(householdReminderSettings.customerId, customerId));
  return { factors: row?.factors ?? [], emailOff: row?.emailOff ?? [] };
}

/** What is due at each of the household's homes, soonest first, with where "Book a tune-up" goes. */
export async function myReminders(deps: Deps, user: SessionUser): Promise<MyReminders> {
  const { db } = deps.database;
  const customerId = household(user);
  const [info, prefs, homes, units, visitRows, changes, live, [me]] = await Promise.all([
    companyRow(db),
    preferences(deps, customerId),
    db
      .select({ id: properties.id })
      .from(properties)
      .where(and(eq(properties.customerId, customerId), isNull(properties.archivedAt))),
    db
      .select({ id: equipment.id, propertyId: equipment.propertyId, kind: equipment.kind, filterSize: equipment.filterSize, filterType: equipment.filterType })
      .from(equipment)
      .innerJoin(properties, eq(properties.id, equipment.propertyId))
      .where(and(eq(properties.customerId, customerId), isNull(equipment.archivedAt), isNull(properties.archivedAt))),
    db
      .select({ propertyId: visits.propertyId, kind: visits.kind, status: visits.status, startsAt: visits.startsAt, recommendations: visits.recommendations })
      .from(visits)
      .where(and(eq(visits.customerId, customerId), sql`${visits.startsAt} > now() - interval '800 days'`)),
    db.select({ equipmentId: filterChanges.equipmentId, changedOn: filterChanges.changedOn }).from(filterChanges).where(eq(filterChanges.customerId, customerId)),
    db
      .select({
        id: agreements.id,
        propertyId: agreements.propertyId,
        status: agreements.status,
        endsOn: agreements.endsOn,
        coolingVisits: planVersions.coolingVisits,
        heatingVisits: planVersions.heatingVisits,
      })
      .from(agreements)
      .innerJoin(planVersions, eq(planVersions.id, agreements.planVersionId))
      .where(and(eq(agreements.customerId, customerId), inArray(agreements.status, ['active', 'renewal_due'])))
      .orderBy(desc(agreements.endsOn)),
    db.select({ email: customers.email }).from(customers).where(eq(customers.id, customerId)),
  ]);
  const notices = live.length
    ? await db
        .select({ agreementId: renewalNotices.agreementId, termEndsOn: renewalNotices.termEndsOn, daysBefore: renewalNotices.daysBefore })
        .from(renewalNotices)
        .where(
          inArray(
            renewalNotices.agreementId,
            live.map((a) => a.id),
          ),
        )
    : [];
  const suppressed = me?.email
    ? (
        await db
          .select({ id: mailSuppressions.id })
          .from(mailSuppressions)
          .where(and(sql`lower(${mailSuppressions.email}) = lower(${me.email})`, eq(mailSuppressions.purpose, 'reminders')))
          .limit(1)
      ).length > 0
    : false;
  const today = DateTime.fromISO(localDate(deps.clock(), info.timeZone), { zone: info.timeZone });
  const seasons = { coolingStartMonth: info.coolingStartMonth, heatingStartMonth: info.heatingStartMonth };
  const items: MyDueItem[] = [];
  for (const home of homes) {
    const a = live.find((x) => x.propertyId === home.id) ?? null;
    const records: HomeRecords = {
      factors: prefs.factors,
      agreement: a && {
        status: a.status,
        coolingVisits: a.coolingVisits,
        heatingVisits: a.heatingVisits,
        termEnd: a.endsOn,
        noticesSent: notices.filter((n) => n.agreementId === a.id && n.termEndsOn === a.endsOn && n.daysBefore !== null).map((n) => n.daysBefore as RenewalNotice),
      },
      equipment: units.filter((u) => u.propertyId === home.id),
      visits: visitRows.filter((v) => v.propertyId === home.id).map((v) => ({ ...v, startsAt: v.startsAt.toISOString() })),
      filterChanges: Object.fromEntries(changes.map((c) => [c.equipmentId, c.changedOn])),
    };
    for (const i of dueItems(records, today, seasons)) {
      const bookable = i.kind !== 'filter' && i.kind !== 'renewal';
      items.push({ ...i, propertyId: home.id, bookingPath: bookable ? `/portal/booking?kind=tune_up&property=${home.id}` : null });
    }
  }
  items.sort((x, y) => x.inDays - y.inDays);
  return { items, preferences: prefs, unsubscribed: suppressed };
}

/** "I changed it": the filter's interval counts from today (the company's date). */
export async function markFilterChanged(deps: Deps, user: SessionUser, equipmentId: string): Promise<MyReminders> {
  const { db } = deps.database;
  const customerId = household(user);
  const [unit] = await db
    .select({ id: equipment.id })
    .from(equipment)
    .innerJoin(properties, eq(properties.id, equipment.propertyId))
    .where(and(eq(equipment.id, equipmentId), eq(properties.customerId, customerId), isNull(equipment.archivedAt)));
  // Another household's equipment answers as if it did not exist.
  if (!unit) throw notFound('That equipment');
  const info = await companyRow(db);
  const changedOn = localDate(deps.clock(), info.timeZone);
  await db
    .insert(filterChanges)
    .values({ equipmentId, customerId, changedOn })
    .onConflictDoUpdate({ target: filterChanges.equipmentId, set: { changedOn, customerId, changedAt: deps.clock() } });
  return myReminders(deps, user);
}

export async function savePreferences(deps: Deps, user: SessionUser, prefs: ReminderPreferences): Promise<ReminderPreferences> {
  const customerId = household(user);
  const value = { factors: [...new Set(prefs.factors)], emailOff: [...new Set(prefs.emailOff)] };
  await deps.database.db
    .insert(householdReminderSettings)
    .values({ customerId, ...value })
    .onConflictDoUpdate({ target: householdReminderSettings.customerId, set: { ...value, updatedAt: deps.clock() } });
  return value;
}
