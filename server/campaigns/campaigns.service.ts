import { and, asc, desc, eq, inArray, isNotNull, isNull, sql } from 'drizzle-orm';
import { DateTime } from 'luxon';
import { REMINDER_KINDS, REMINDER_LABELS, reminderDecision, reminderWording, type ReminderHousehold, type ReminderKind } from '../../shared/seasonal-reminders';
import type { ReminderCampaignSummary, ReminderPreview, ReminderRecipient } from '../../shared/schemas/campaigns';
import type { SessionUser } from '../../shared/schemas/session';
import type { AppDeps } from '../deps';
import type { Db, Tx } from '../db/client';
import { isSuppressed, unsubscribeLinks } from '../mail/unsubscribe';
import { agreements, customers, equipment, planVersions, properties, reminderCampaigns, reminderSends, users, visits } from '../db/schema';
import { companyRow } from '../company/company';
import { AppError, notFound } from '../http/errors';
import { renderEmail } from '../integrations/mail-layout';

export const CAMPAIGN_QUEUE = 'reminders.send';
const BATCH = 25;

/** Every live household with what the rules need, in five queries (no per-household queries). */
async function loadHouseholds(db: Db): Promise<(ReminderHousehold & { name: string })[]> {
  const rows = await db
    .select({ id: customers.id, name: customers.name, email: customers.email })
    .from(customers)
    .where(and(isNull(customers.archivedAt), isNull(customers.mergedIntoId)))
    .orderBy(asc(customers.name));
  const ids = rows.map((r) => r.id);
  if (!ids.length) return [];
  const [agreementRows, visitRows, equipmentRows, sentRows] = await Promise.all([
    db
      .select({ customerId: agreements.customerId, status: agreements.status, coolingVisits: planVersions.coolingVisits, heatingVisits: planVersions.heatingVisits, extras: planVersions.extras, endsOn: agreements.endsOn })
      .from(agreements)
      .innerJoin(planVersions, eq(planVersions.id, agreements.planVersionId))
      .where(inArray(agreements.customerId, ids))
      .orderBy(desc(agreements.endsOn)),
    db
      .select({ customerId: visits.customerId, kind: visits.kind, status: visits.status, startsAt: visits.startsAt, recommendations: visits.recommendations })
      .from(visits)
      .where(and(inArray(visits.customerId, ids), sql`${visits.startsAt} > now() - interval '400 days'`)),
    db
      .select({ customerId: properties.customerId, kind: equipment.kind, filterSize: equipment.filterSize, filterType: equipment.filterType })
      .from(equipment)
      .innerJoin(properties, eq(properties.id, equipment.propertyId))
      .where(and(inArray(properties.customerId, ids), isNull(equipment.archivedAt), isNull(properties.archivedAt))),
    db
      .select({ customerId: reminderSends.customerId, kind: reminderSends.kind, last: sql<Date>`max(${reminderSends.sentAt})` })
      .from(reminderSends)
      .where(and(inArray(reminderSends.customerId, ids), isNotNull(reminderSends.sentAt)))
      .groupBy(reminderSends.customerId, reminderSends.kind),
  ]);
  const byCustomer = new Map(rows.map((r) => [r.id, { customerId: r.id, name: r.name, email: r.email, agreement: null, visits: [], equipment: [], lastSent: {} } as ReminderHousehold & { name: string }]));
  for (const a of agreementRows) {
    const h = byCustomer.get(a.customerId)!;
    // Rows come newest term first: the first live one is the agreement in force.
    if (!h.agreement || (h.agreement.status !== 'active' && h.agreement.status !== 'renewal_due')) h.agreement = a;
  }
  for (const v of visitRows) byCustomer.get(v.customerId)!.visits.push({ ...v, startsAt: v.startsAt.toISOString() });
  for (const e of equipmentRows) byCustomer.get(e.customerId)!.equipment.push(e);
  for (const s of sentRows) byCustomer.get(s.customerId)!.lastSent[s.kind] = new Date(s.last).toISOString();
  return [...byCustomer.values()];
}

export async function previewReminders(deps: Pick<AppDeps, 'database' | 'clock'>, kind: ReminderKind): Promise<ReminderPreview> {
  const { db } = deps.database;
  const now = deps.clock();
  const info = await companyRow(db);
  const today = DateTime.fromJSDate(now).setZone(info.timeZone);
  const households = await loadHouseholds(db);
  const audience: ReminderRecipient[] = [];
  for (const h of households) {
    // The owner's season months: the same table coverage and the checklists use.
    const d = reminderDecision(kind, h, today, { coolingStartMonth: info.coolingStartMonth, heatingStartMonth: info.heatingStartMonth });
    if (d.due && h.email) audience.push({ customerId: h.customerId, name: h.name, email: h.email, reason: d.reason });
  }
  return { kind, label: REMINDER_LABELS[kind], subject: reminderWording(kind, info.name).subject, audience, skipped: households.length - audience.length };
}

/**
 * Creates a campaign and its sends in one transaction, then queues the sending. If the audience
 * changed since the office looked, nothing is created and the new count is reported.
 */
export async function createCampaign(deps: Pick<AppDeps, 'database' | 'clock' | 'jobs'>, user: SessionUser, kind: ReminderKind, expectedCount: number): Promise<ReminderCampaignSummary> {
  const db = deps.database.db;
  const preview = await previewReminders(deps, kind);
  if (preview.audience.length !== expectedCount) {
    throw new AppError(409, 'audience_changed', `The audience changed: ${preview.audience.length} households are due now, not ${expectedCount}. Review the list and send again.`, { expectedCount: `Now ${preview.audience.length}` });
  }
  if (!preview.audience.length) throw new AppError(422, 'empty_audience', 'Nobody is due for this reminder right now.', { kind: 'No households are due.' });
  const campaignId = await db.transaction(async (tx) => {
    const [campaign] = await tx.insert(reminderCampaigns).values({ kind, createdById: user.id, audienceCount: preview.audience.length }).returning({ id: reminderCampaigns.id });
    await tx.insert(reminderSends).values(preview.audience.map((r) => ({ campaignId: campaign!.id, customerId: r.customerId, kind, email: r.email, reason: r.reason })));
    return campaign!.id;
  });
  await deps.jobs.send(CAMPAIGN_QUEUE, { campaignId }, { singletonKey: campaignId });
  return campaignSummary(deps, campaignId);
}

/**
 * Sends a campaign's pending reminders in batches. Rows are claimed with SKIP LOCKED, so two
 * workers never send the same one, and each message carries a stable Message-ID per send.
 */
export async function sendCampaign(deps: Pick<AppDeps, 'config' | 'database' | 'clock' | 'mailer'>, campaignId: string): Promise<void> {
  const { mailer } = deps;
  const db = deps.database.db;
  const info = await companyRow(db);
  for (;;) {
    const claimed = await db.transaction(async (tx) => {
      const batch = await tx.execute<{ id: string; email: string; kind: ReminderKind; customer_id: string }>(
        sql`select id, email, kind, customer_id from reminder_sends where campaign_id = ${campaignId} and status = 'pending' order by created_at limit ${BATCH} for update skip locked`,
      );
      for (const row of batch.rows) {
        // An address that opted out gets no reminder, checked at the moment of sending.
        if (await isSuppressed(tx, row.email, 'reminders')) {
          await tx.update(reminderSends).set({ status: 'failed', error: 'Unsubscribed: not sent.' }).where(eq(reminderSends.id, row.id));
          continue;
        }
        const words = reminderWording(row.kind, info.name);
        const unsubscribe = unsubscribeLinks(deps, row.customer_id, 'reminders', info.email);
        const { html, text } = renderEmail({
          title: words.subject,
          paragraphs: words.paragraphs,
          action: { label: words.action, url: await bookingLink(tx, deps.config.publicUrl, row.customer_id, row.kind) },
          // Commercial mail carries the sender's postal address and a way to opt out (15 U.S.C. § 7704(a)(5)).
          footer: `${info.name} · ${postalAddress(info)}. You get this because your home is on one of our maintenance plans or its equipment record suggests it is due. Unsubscribe from reminders: ${unsubscribe.url}`,
        });
        try {
          await mailer.send({
            to: row.email,
            fromName: info.name,
            subject: words.subject,
            text,
            html,
            idempotencyKey: `reminder-${row.id}`,
            list: { unsubscribeUrl: unsubscribe.url, unsubscribeMailto: unsubscribe.mailto },
          });
          await tx.update(reminderSends).set({ status: 'sent', sentAt: deps.clock(), error: null }).where(eq(reminderSends.id, row.id));
        } catch (err) {
          await tx.update(reminderSends).set({ status: 'failed', error: err instanceof Error ? err.message.slice(0, 300) : 'send failed' }).where(eq(reminderSends.id, row.id));
        }
      }
      return batch.rows.length;
    });
    if (claimed === 0) break;
  }
  const [left] = await db.select({ n: sql<number>`count(*)::int` }).from(reminderSends).where(and(eq(reminderSends.campaignId, campaignId), eq(reminderSends.status, 'pending')));
  if (left!.n === 0) await db.update(reminderCampaigns).set({ finishedAt: deps.clock() }).where(and(eq(reminderCampaigns.id, campaignId), isNull(reminderCampaigns.finishedAt)));
}

const postalAddress = (c: { street: string; city: string; state: string; zip: string }) => `${c.street}, ${c.city}, ${c.state} ${c.zip}`;

/** Every reminder is for maintenance: its button opens the booking stepper on a tune-up for the household's home. */
async function bookingLink(db: Db | Tx, publicUrl: string, customerId: string, _kind: ReminderKind): Promise<string> {
  const [home] = await db
    .select({ id: properties.id })
    .from(properties)
    .leftJoin(agreements, and(eq(agreements.propertyId, properties.id), inArray(agreements.status, ['active', 'renewal_due'])))
    .where(and(eq(properties.customerId, customerId), isNull(properties.archivedAt)))
    .orderBy(sql`${agreements.id} is null`, asc(properties.createdAt))
    .limit(1);
  const url = new URL('/portal/booking', publicUrl);
  url.searchParams.set('kind', 'tune_up');
  if (home) url.searchParams.set('property', home.id);
  return url.toString();
}

export async function campaignSummary(deps: Pick<AppDeps, 'database'>, campaignId: string): Promise<ReminderCampaignSummary> {
  const list = await listCampaigns(deps, campaignId);
  if (!list.length) throw notFound('That reminder campaign');
  return list[0]!;
}

export async function listCampaigns(deps: Pick<AppDeps, 'database'>, onlyId?: string): Promise<ReminderCampaignSummary[]> {
  const { db } = deps.database;
  const rows = await db
    .select({
      id: reminderCampaigns.id,
      kind: reminderCampaigns.kind,
      audienceCount: reminderCampaigns.audienceCount,
      createdAt: reminderCampaigns.createdAt,
      finishedAt: reminderCampaigns.finishedAt,
      createdBy: users.name,
      sent: sql<number>`count(*) filter (where ${reminderSends.status} = 'sent')::int`,
      failed: sql<number>`count(*) filter (where ${reminderSends.status} = 'failed')::int`,
      pending: sql<number>`count(*) filter (where ${reminderSends.status} = 'pending')::int`,
    })
    .from(reminderCampaigns)
    .innerJoin(users, eq(users.id, reminderCampaigns.createdById))
    .leftJoin(reminderSends, eq(reminderSends.campaignId, reminderCampaigns.id))
    .where(onlyId ? eq(reminderCampaigns.id, onlyId) : undefined)
    .groupBy(reminderCampaigns.id, users.name)
    .orderBy(desc(reminderCampaigns.createdAt))
    .limit(50);
  return rows.map((r) => ({ ...r, label: REMINDER_LABELS[r.kind], createdAt: r.createdAt.toISOString(), finishedAt: r.finishedAt?.toISOString() ?? null }));
}

export function registerCampaignJobs(deps: Pick<AppDeps, 'config' | 'database' | 'clock' | 'mailer' | 'jobs'>): void {
  deps.jobs.register<{ campaignId: string }>(CAMPAIGN_QUEUE, async ({ campaignId }) => sendCampaign(deps, campaignId));
}

export { REMINDER_KINDS };
