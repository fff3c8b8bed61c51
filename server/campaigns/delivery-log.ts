import { sql } from 'drizzle-orm';
import { REMINDER_LABELS, type ReminderKind } from '../../shared/seasonal-reminders';
import type { CampaignRecipientEntry, DeliveryPageQuery, HouseholdReminderEntry, KeysetPage, ReminderSendStatus } from '../../shared/schemas/campaigns';
import type { AppDeps } from '../deps';
import { notFound } from '../http/errors';
import { decodeCursor, keysetPage } from '../http/keyset';

/**
 * The delivery log, read from the outbox itself: per campaign, every household with what became of
 * its message (queued, sent with the server's reply, failed with its refusal, unsubscribed); per
 * household, every reminder it was sent. Both in keyset pages.
 */
export const DELIVERY_PAGE = 50;

type Deps = Pick<AppDeps, 'database'>;

const iso = (t: string | Date | null) => (t === null ? null : new Date(t).toISOString());

export async function campaignRecipients(deps: Deps, campaignId: string, q: DeliveryPageQuery, limit = DELIVERY_PAGE): Promise<KeysetPage<CampaignRecipientEntry>> {
  const { db } = deps.database;
  const after = decodeCursor(q.after, 2);
  const exists = await db.execute(sql`select 1 from reminder_campaigns where id = ${campaignId}`);
  if (!exists.rows.length) throw notFound('That reminder campaign');
  const rows = await db.execute<{
    id: string;
    customer_id: string;
    name: string;
    email: string;
    status: ReminderSendStatus;
    reply: string | null;
    attempts: number;
    sent_at: string | null;
  }>(sql`select rs.id, rs.customer_id, c.name, rs.email, rs.status, coalesce(rs.smtp_reply, rs.error) as reply, rs.attempts, rs.sent_at
    from reminder_sends rs join customers c on c.id = rs.customer_id
    where rs.campaign_id = ${campaignId}
      ${q.status ? sql`and rs.status = ${q.status}` : sql``}
      ${after ? sql`and (c.name, rs.id) > (${after[0]}, ${after[1]}::uuid)` : sql``}
    order by c.name, rs.id limit ${limit + 1}`);
  return keysetPage(
    rows.rows,
    limit,
    (r) => [r.name, r.id],
    (r) => ({ sendId: r.id, customerId: r.customer_id, name: r.name, email: r.email, status: r.status, reply: r.reply, attempts: r.attempts, sentAt: iso(r.sent_at) }),
  );
}

export async function householdReminders(deps: Deps, customerId: string, q: DeliveryPageQuery, limit = DELIVERY_PAGE): Promise<KeysetPage<HouseholdReminderEntry>> {
  const { db } = deps.database;
  const after = decodeCursor(q.after, 2);
  const exists = await db.execute(sql`select 1 from customers where id = ${customerId}`);
  if (!exists.rows.length) throw notFound('That household');
  const rows = await db.execute<{
    id: string;
    campaign_id: string;
    kind: ReminderKind;
    email: string;
    status: ReminderSendStatus;
    reply: string | null;
    created_key: string;
    sent_at: string | null;
  }>(sql`select rs.id, rs.campaign_id, rs.kind, rs.email, rs.status, coalesce(rs.smtp_reply, rs.error) as reply, rs.created_at::text as created_key, rs.sent_at
    from reminder_sends rs
    where rs.customer_id = ${customerId}
      ${q.status ? sql`and rs.status = ${q.status}` : sql``}
      ${after ? sql`and (rs.created_at, rs.id) < (${after[0]}::timestamptz, ${after[1]}::uuid)` : sql``}
    order by rs.created_at desc, rs.id desc limit ${limit + 1}`);
  return keysetPage(
    rows.rows,
    limit,
    (r) => [r.created_key, r.id],
    (r) => ({
      sendId: r.id,
      campaignId: r.campaign_id,
      kind: r.kind,
      label: REMINDER_LABELS[r.kind],
      email: r.email,
      status: r.status,
      reply: r.reply,
      queuedAt: iso(r.created_key)!,
      sentAt: iso(r.sent_at),
    }),
  );
}
