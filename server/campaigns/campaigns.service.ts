import { and, desc, eq, inArray, sql } from 'drizzle-orm';
import { DateTime } from 'luxon';
import { REMINDER_KINDS, REMINDER_LABELS, reminderWording, type ReminderKind } from '../../shared/seasonal-reminders';
import {
  CAMPAIGN_SCHEDULE_MONTHS,
  type AudienceFilter,
  type CampaignStatus,
  type DeliveryLogEntry,
  type MessagePreview,
  type ReminderCampaignSummary,
  type ReminderPreview,
} from '../../shared/schemas/campaigns';
import type { SessionUser } from '../../shared/schemas/session';
import type { AppDeps } from '../deps';
import { customers, reminderCampaigns, reminderDeliveries, reminderSends, users } from '../db/schema';
import { companyRow } from '../company/company';
import { AppError, notFound } from '../http/errors';
import { audienceCount, audiencePage, fillOutbox, type AudienceContext } from './audience';
import { campaignMail } from './campaign-message';
import { DEFAULT_TUNING, workCampaign, type SendTuning } from './campaign-send';

export const CAMPAIGN_QUEUE = 'reminders.send';
export const CAMPAIGN_RESUME_QUEUE = 'reminders.resume';
const PAGE = 200;

type Deps = Pick<AppDeps, 'database' | 'clock'>;

async function context(deps: Deps, kind: ReminderKind, filter: AudienceFilter): Promise<AudienceContext & { companyName: string }> {
  const info = await companyRow(deps.database.db);
  return {
    kind,
    filter,
    now: deps.clock(),
    timeZone: info.timeZone,
    seasons: { coolingStartMonth: info.coolingStartMonth, heatingStartMonth: info.heatingStartMonth },
    companyName: info.name,
  };
}

/** The count and one keyset page of who is due. */
export async function previewReminders(deps: Deps, kind: ReminderKind, filter: AudienceFilter = {}, after: string | null = null): Promise<ReminderPreview> {
  const ctx = await context(deps, kind, filter);
  const { db } = deps.database;
  const [count, page, total] = await Promise.all([
    audienceCount(db, ctx),
    audiencePage(db, ctx, after, PAGE),
    db.execute<{ n: number }>(sql`select count(*)::int as n from customers where archived_at is null and merged_into_id is null`),
  ]);
  return {
    kind,
    label: REMINDER_LABELS[kind],
    subject: reminderWording(kind, ctx.companyName).subject,
    audience: page.rows.map((r) => ({ customerId: r.customer_id, name: r.name, email: r.email, reason: r.reason })),
    count,
    skipped: total.rows[0]!.n - count,
    next: page.next,
  };
}

/** The personalised message, HTML and text, for the first three households of the audience. */
export async function previewMessages(deps: Pick<AppDeps, 'database' | 'clock' | 'config'>, kind: ReminderKind, filter: AudienceFilter = {}): Promise<MessagePreview[]> {
  const ctx = await context(deps, kind, filter);
  const company = await companyRow(deps.database.db);
  const page = await audiencePage(deps.database.db, ctx, null, 3);
  return page.rows.map((r) => {
    const m = campaignMail(deps, company, { id: `preview-${r.customer_id}`, customerId: r.customer_id, propertyId: r.property_id, email: r.email, name: r.name, kind });
    return { customerId: r.customer_id, name: r.name, email: r.email, subject: m.subject, html: m.html!, text: m.text };
  });
}

/** "2026-09-01T08:00" in the company's zone, as an instant in the future and within the schedule horizon. */
function scheduleInstant(local: string, timeZone: string, now: Date): Date {
  const at = DateTime.fromISO(local, { zone: timeZone });
  if (!at.isValid) throw new AppError(422, 'invalid_input', 'Send at is not a valid time.', { sendAt: 'Not a valid date and time.' });
  if (at.toMillis() <= now.getTime()) throw new AppError(422, 'invalid_input', 'Send at is in the past.', { sendAt: 'Choose a time in the future, or send now.' });
  if (at > DateTime.fromJSDate(now, { zone: timeZone }).plus({ months: CAMPAIGN_SCHEDULE_MONTHS })) {
    throw new AppError(422, 'invalid_input', 'Send at is too far ahead.', { sendAt: `Schedule a campaign at most ${CAMPAIGN_SCHEDULE_MONTHS} months ahead.` });
  }
  return at.toJSDate();
}

/**
 * Creates a campaign. Sent now: its outbox is written from the audience statement in the same
 * transaction, and refused if the audience changed since the office looked. Scheduled: the
 * outbox is written when its time comes, from the audience as it stands then.
 */
export async function createCampaign(
  deps: Pick<AppDeps, 'database' | 'clock' | 'jobs'>,
  user: SessionUser,
  input: { kind: ReminderKind; audience?: AudienceFilter; expectedCount: number; sendAt?: string | undefined },
): Promise<ReminderCampaignSummary> {
  const { db } = deps.database;
  const filter = input.audience ?? {};
  const ctx = await context(deps, input.kind, filter);
  const scheduledAt = input.sendAt ? scheduleInstant(input.sendAt, ctx.timeZone, ctx.now) : null;
  const id = await db.transaction(async (tx) => {
    const [c] = await tx
      .insert(reminderCampaigns)
      .values({
        kind: input.kind,
        createdById: user.id,
        audienceCount: input.expectedCount,
        audience: filter,
        status: scheduledAt ? 'scheduled' : 'sending',
        scheduledAt,
        startedAt: scheduledAt ? null : ctx.now,
      })
      .returning({ id: reminderCampaigns.id });
    if (scheduledAt) return c!.id;
    const n = await fillOutbox(tx, c!.id, ctx);
    if (n !== input.expectedCount) {
      throw new AppError(409, 'audience_changed', `The audience changed: ${n} households are due now, not ${input.expectedCount}. Review the list and send again.`, {
        expectedCount: `Now ${n}`,
      });
    }
    if (n === 0) throw new AppError(422, 'empty_audience', 'Nobody is due for this reminder right now.', { kind: 'No households are due.' });
    return c!.id;
  });
  await deps.jobs.send(CAMPAIGN_QUEUE, { campaignId: id }, scheduledAt ? { startAfter: scheduledAt } : {});
  return campaignSummary(deps, id);
}

/** A scheduled campaign whose time has come: its outbox from today's audience, then sending. */
async function startScheduled(deps: Deps, campaignId: string): Promise<boolean> {
  const { db } = deps.database;
  return db.transaction(async (tx) => {
    const [c] = await tx.select().from(reminderCampaigns).where(eq(reminderCampaigns.id, campaignId)).for('update');
    if (!c || c.status !== 'scheduled' || (c.scheduledAt && c.scheduledAt > deps.clock())) return false;
    const ctx = await context(deps, c.kind, c.audience);
    const n = await fillOutbox(tx, c.id, ctx);
    await tx
      .update(reminderCampaigns)
      .set({ status: n ? 'sending' : 'done', audienceCount: n, startedAt: deps.clock(), finishedAt: n ? null : deps.clock(), updatedAt: deps.clock() })
      .where(eq(reminderCampaigns.id, c.id));
    return n > 0;
  });
}

const NEXT: Record<'pause' | 'resume' | 'cancel', { from: CampaignStatus[]; to: CampaignStatus }> = {
  pause: { from: ['sending', 'scheduled'], to: 'paused' },
  resume: { from: ['paused'], to: 'sending' },
  cancel: { from: ['draft', 'scheduled', 'sending', 'paused'], to: 'cancelled' },
};

export async function actOnCampaign(
  deps: Pick<AppDeps, 'database' | 'clock' | 'jobs'>,
  campaignId: string,
  action: 'pause' | 'resume' | 'cancel',
): Promise<ReminderCampaignSummary> {
  const { db } = deps.database;
  const step = NEXT[action];
  const resumed = await db.transaction(async (tx) => {
    const [c] = await tx
      .select({ status: reminderCampaigns.status, scheduledAt: reminderCampaigns.scheduledAt, startedAt: reminderCampaigns.startedAt })
      .from(reminderCampaigns)
      .where(eq(reminderCampaigns.id, campaignId))
      .for('update');
    if (!c) throw notFound('That reminder campaign');
    if (!step.from.includes(c.status))
      throw new AppError(409, 'campaign_state', `A campaign that is ${c.status} cannot be ${action === 'cancel' ? 'cancelled' : action + 'd'}.`, {
        action: `Not possible while ${c.status}.`,
      });
    // A paused campaign that never started goes back to waiting for its time.
    const to = action === 'resume' && !c.startedAt ? 'scheduled' : step.to;
    await tx
      .update(reminderCampaigns)
      .set({ status: to, updatedAt: deps.clock(), ...(to === 'cancelled' ? { finishedAt: deps.clock() } : {}) })
      .where(eq(reminderCampaigns.id, campaignId));
    if (to === 'cancelled')
      await tx
        .update(reminderSends)
        .set({ status: 'cancelled' })
        .where(and(eq(reminderSends.campaignId, campaignId), eq(reminderSends.status, 'pending')));
    return to === 'sending' || to === 'scheduled' ? (c.scheduledAt && to === 'scheduled' ? c.scheduledAt : 'now') : null;
  });
  if (resumed) await deps.jobs.send(CAMPAIGN_QUEUE, { campaignId }, resumed instanceof Date && resumed > deps.clock() ? { startAfter: resumed } : {});
  return campaignSummary(deps, campaignId);
}

export async function campaignSummary(deps: Pick<AppDeps, 'database'>, campaignId: string): Promise<ReminderCampaignSummary> {
  const list = await listCampaigns(deps, campaignId);
  if (!list.length) throw notFound('That reminder campaign');
  return list[0]!;
}

export async function listCampaigns(deps: Pick<AppDeps, 'database'>, onlyId?: string): Promise<ReminderCampaignSummary[]> {
  const { db } = deps.database;
  const counts = db
    .select({
      campaignId: reminderSends.campaignId,
      sent: sql<number>`count(*) filter (where ${reminderSends.status} = 'sent')::int`.as('sent'),
      failed: sql<number>`count(*) filter (where ${reminderSends.status} = 'failed')::int`.as('failed'),
      suppressed: sql<number>`count(*) filter (where ${reminderSends.status} = 'suppressed')::int`.as('suppressed'),
      pending: sql<number>`count(*) filter (where ${reminderSends.status} in ('pending', 'sending'))::int`.as('pending'),
    })
    .from(reminderSends)
    .where(onlyId ? eq(reminderSends.campaignId, onlyId) : undefined)
    .groupBy(reminderSends.campaignId)
    .as('counts');
  const rows = await db
    .select({
      id: reminderCampaigns.id,
      kind: reminderCampaigns.kind,
      status: reminderCampaigns.status,
      audience: reminderCampaigns.audience,
      audienceCount: reminderCampaigns.audienceCount,
      scheduledAt: reminderCampaigns.scheduledAt,
      createdAt: reminderCampaigns.createdAt,
      finishedAt: reminderCampaigns.finishedAt,
      createdBy: users.name,
      sent: sql<number>`coalesce(${counts.sent}, 0)`,
      failed: sql<number>`coalesce(${counts.failed}, 0)`,
      suppressed: sql<number>`coalesce(${counts.suppressed}, 0)`,
      pending: sql<number>`coalesce(${counts.pending}, 0)`,
    })
    .from(reminderCampaigns)
    .innerJoin(users, eq(users.id, reminderCampaigns.createdById))
    .leftJoin(counts, eq(counts.campaignId, reminderCampaigns.id))
    .where(onlyId ? eq(reminderCampaigns.id, onlyId) : undefined)
    .orderBy(desc(reminderCampaigns.createdAt))
    .limit(50);
  return rows.map((r) => ({
    ...r,
    label: REMINDER_LABELS[r.kind],
    scheduledAt: r.scheduledAt?.toISOString() ?? null,
    createdAt: r.createdAt.toISOString(),
    finishedAt: r.finishedAt?.toISOString() ?? null,
  }));
}

/** The delivery log of one campaign, newest first, optionally for one household. */
export async function deliveryLog(deps: Pick<AppDeps, 'database'>, campaignId: string, customerId?: string): Promise<DeliveryLogEntry[]> {
  const { db } = deps.database;
  await campaignSummary(deps, campaignId);
  const rows = await db
    .select({
      customerId: reminderDeliveries.customerId,
      name: customers.name,
      event: reminderDeliveries.event,
      detail: reminderDeliveries.detail,
      permanent: reminderDeliveries.permanent,
      at: reminderDeliveries.createdAt,
    })
    .from(reminderDeliveries)
    .innerJoin(customers, eq(customers.id, reminderDeliveries.customerId))
    .where(and(eq(reminderDeliveries.campaignId, campaignId), customerId ? eq(reminderDeliveries.customerId, customerId) : undefined))
    .orderBy(desc(reminderDeliveries.createdAt))
    .limit(200);
  return rows.map((r) => ({ ...r, at: r.at.toISOString() }));
}

/** Runs one campaign job: starts a scheduled campaign when due, sends, and queues the next job. */
export async function runCampaignJob(
  deps: Pick<AppDeps, 'config' | 'database' | 'clock' | 'mailer' | 'logger' | 'jobs'>,
  campaignId: string,
  tuning: SendTuning = DEFAULT_TUNING,
): Promise<void> {
  const [c] = await deps.database.db.select({ status: reminderCampaigns.status }).from(reminderCampaigns).where(eq(reminderCampaigns.id, campaignId));
  if (c?.status === 'scheduled' && !(await startScheduled(deps, campaignId))) return;
  if (c?.status !== 'scheduled' && c?.status !== 'sending') return;
  const next = await workCampaign(deps, campaignId, tuning);
  if (next instanceof Date) await deps.jobs.send(CAMPAIGN_QUEUE, { campaignId }, next > deps.clock() ? { startAfter: next } : {});
}

/** Sends a campaign to the end in this process (tests and one-off runs). */
export async function sendCampaign(
  deps: Pick<AppDeps, 'config' | 'database' | 'clock' | 'mailer' | 'logger'>,
  campaignId: string,
  tuning: SendTuning = DEFAULT_TUNING,
): Promise<void> {
  await deps.database.db
    .update(reminderCampaigns)
    .set({ status: 'sending' })
    .where(and(eq(reminderCampaigns.id, campaignId), inArray(reminderCampaigns.status, ['draft'])));
  for (;;) {
    const next = await workCampaign(deps, campaignId, tuning);
    if (!(next instanceof Date)) return;
    const wait = next.getTime() - deps.clock().getTime();
    if (wait > 0) await new Promise((r) => setTimeout(r, Math.min(wait, 5000)));
  }
}

export function registerCampaignJobs(deps: Pick<AppDeps, 'config' | 'database' | 'clock' | 'mailer' | 'logger' | 'jobs'>, tuning: SendTuning = DEFAULT_TUNING): void {
  deps.jobs.register<{ campaignId: string }>(CAMPAIGN_QUEUE, async ({ campaignId }) => runCampaignJob(deps, campaignId, tuning), {
    queue: { name: CAMPAIGN_QUEUE, retryLimit: 10, retryDelay: 10, retryBackoff: true, expireInSeconds: Math.ceil(tuning.budgetMs / 1000) * 3 },
  });
  // After a crash or a lost job: every campaign still sending, or due to start, gets a job again.
  // Two jobs on one campaign are harmless: rows are claimed one worker at a time.
  deps.jobs.register(
    CAMPAIGN_RESUME_QUEUE,
    async () => {
      const open = await deps.database.db.execute<{ id: string }>(
        sql`select id from reminder_campaigns where status = 'sending' or (status = 'scheduled' and scheduled_at <= now()) limit 100`,
      );
      for (const r of open.rows) await deps.jobs.send(CAMPAIGN_QUEUE, { campaignId: r.id });
    },
    { cron: '* * * * *' },
  );
}

export { REMINDER_KINDS };
