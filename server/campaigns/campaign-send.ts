import { sql } from 'drizzle-orm';
import type { ReminderKind } from '../../shared/seasonal-reminders';
import type { AppDeps } from '../deps';
import { companyRow } from '../company/company';
import { isPermanent } from '../mail/outbox';
import { campaignMail, type CampaignRecipient } from './campaign-message';

/**
 * Sending a campaign from its outbox (reminder_sends). A row is claimed ('sending') just before
 * its message goes to SMTP and marked 'sent' in its own statement the moment the server accepts
 * it. A worker that dies leaves its claimed rows behind; once the claim is stale they are taken
 * again, so a restart picks up exactly where the outbox stands. Suppression is read at send time.
 */
export type SendDeps = Pick<AppDeps, 'config' | 'database' | 'clock' | 'mailer' | 'logger'>;

export interface SendTuning {
  /** Rows claimed per batch. */
  batch: number;
  /** Messages in flight at once. */
  concurrency: number;
  /** A claim older than this belongs to a worker that stopped. */
  staleClaimMs: number;
  /** First retry delay after a temporary SMTP failure; doubles each attempt. */
  retryBaseMs: number;
  maxAttempts: number;
  /** One job works this long, then hands over to the next job. */
  budgetMs: number;
}

export const DEFAULT_TUNING: SendTuning = { batch: 200, concurrency: 4, staleClaimMs: 120_000, retryBaseMs: 30_000, maxAttempts: 6, budgetMs: 60_000 };

export type BatchOutcome = { claimed: number; sent: number; failed: number; suppressed: number; retry: number };

type Claimed = {
  id: string;
  customer_id: string;
  property_id: string | null;
  email: string;
  kind: ReminderKind;
  attempts: number;
  name: string;
};

/** Claims and sends one batch; returns what happened. Stops early when the campaign is paused or cancelled. */
export async function sendBatch(deps: SendDeps, campaignId: string, tuning: SendTuning = DEFAULT_TUNING): Promise<BatchOutcome> {
  const { db } = deps.database;
  const now = deps.clock();
  const staleBefore = new Date(now.getTime() - tuning.staleClaimMs);
  const claimed = await db.execute<Claimed>(sql`
    update reminder_sends rs set status = 'sending', claimed_at = ${now}, attempts = rs.attempts + 1
    from customers c
    where c.id = rs.customer_id and rs.id in (
      select s.id from reminder_sends s join reminder_campaigns rc on rc.id = s.campaign_id
      where s.campaign_id = ${campaignId} and rc.status = 'sending'
        and ((s.status = 'pending' and (s.next_attempt_at is null or s.next_attempt_at <= ${now})) or (s.status = 'sending' and s.claimed_at < ${staleBefore}))
      order by s.id limit ${tuning.batch} for update of s skip locked)
    returning rs.id, rs.customer_id, rs.property_id, rs.email, rs.kind, rs.attempts, c.name`);
  const out: BatchOutcome = { claimed: claimed.rows.length, sent: 0, failed: 0, suppressed: 0, retry: 0 };
  if (!claimed.rows.length) return out;

  const company = await companyRow(db);
  const emails = claimed.rows.map((r) => r.email.toLowerCase());
  const suppressed = await db.execute<{ email: string }>(
    sql`select lower(email) as email from mail_suppressions where purpose = 'reminders' and lower(email) in (select jsonb_array_elements_text(${JSON.stringify(emails)}::jsonb))`,
  );
  const off = new Set(suppressed.rows.map((r) => r.email));

  const record = (id: string, status: string, event: string, detail: string, extra = sql``, permanent = false) =>
    db.execute(sql`with u as (update reminder_sends set status = ${status}, error = ${detail || null} ${extra} where id = ${id} and status = 'sending' returning campaign_id, customer_id)
      insert into reminder_deliveries (campaign_id, customer_id, event, detail, permanent) select campaign_id, customer_id, ${event}, ${detail}, ${permanent} from u`);

  let next = 0;
  let stopped = false;
  const work = async () => {
    for (;;) {
      const row = claimed.rows[next++];
      if (!row) return;
      if (stopped) {
        // Paused or cancelled mid-batch: hand the row back untouched.
        await db.execute(sql`update reminder_sends set status = 'pending', attempts = attempts - 1 where id = ${row.id} and status = 'sending'`);
        continue;
      }
      if (off.has(row.email.toLowerCase())) {
        await record(row.id, 'suppressed', 'suppressed', 'Unsubscribed: not sent.');
        out.suppressed++;
        continue;
      }
      const r: CampaignRecipient = { id: row.id, customerId: row.customer_id, propertyId: row.property_id, email: row.email, name: row.name, kind: row.kind };
      try {
        const mail = campaignMail(deps, company, r);
        await deps.mailer.send(mail);
        await record(row.id, 'sent', 'sent', '', sql`, sent_at = now()`);
        out.sent++;
      } catch (err) {
        const message = ((err as Error).message ?? String(err)).slice(0, 300);
        if (isPermanent(err) || row.attempts >= tuning.maxAttempts) {
          await record(row.id, 'failed', 'failed', message, sql``, isPermanent(err));
          out.failed++;
        } else {
          const at = new Date(deps.clock().getTime() + tuning.retryBaseMs * 2 ** (row.attempts - 1));
          await record(row.id, 'pending', 'retry', message, sql`, next_attempt_at = ${at}`);
          out.retry++;
        }
      }
    }
  };
  const watch = setInterval(() => {
    void db.execute<{ status: string }>(sql`select status from reminder_campaigns where id = ${campaignId}`).then(
      (r) => {
        if (r.rows[0]?.status !== 'sending') stopped = true;
      },
      () => undefined,
    );
  }, 500);
  try {
    await Promise.all(Array.from({ length: Math.max(1, tuning.concurrency) }, work));
  } finally {
    clearInterval(watch);
  }
  return out;
}

/**
 * Works a campaign until its outbox is empty, it is paused or cancelled, or the time budget is
 * spent. Returns when to look again: 'done', 'stopped', or a Date (a retry is waiting, or the
 * budget ran out and the next job carries on).
 */
export async function workCampaign(deps: SendDeps, campaignId: string, tuning: SendTuning = DEFAULT_TUNING): Promise<'done' | 'stopped' | Date> {
  const { db } = deps.database;
  const started = Date.now();
  for (;;) {
    const b = await sendBatch(deps, campaignId, tuning);
    if (b.claimed && Date.now() - started < tuning.budgetMs) continue;
    if (b.claimed) return deps.clock();
    const [state] = (
      await db.execute<{ status: string; open: number; next_at: string | null; stale_at: string | null }>(sql`
        select rc.status,
          (select count(*)::int from reminder_sends s where s.campaign_id = rc.id and s.status in ('pending', 'sending')) as open,
          (select min(s.next_attempt_at)::text from reminder_sends s where s.campaign_id = rc.id and s.status = 'pending') as next_at,
          (select min(s.claimed_at)::text from reminder_sends s where s.campaign_id = rc.id and s.status = 'sending') as stale_at
        from reminder_campaigns rc where rc.id = ${campaignId}`)
    ).rows;
    if (!state || state.status !== 'sending') return 'stopped';
    if (state.open === 0) {
      await db.execute(sql`update reminder_campaigns set status = 'done', finished_at = now(), updated_at = now() where id = ${campaignId} and status = 'sending'`);
      return 'done';
    }
    const times = [state.next_at ? new Date(state.next_at).getTime() : Infinity, state.stale_at ? new Date(state.stale_at).getTime() + tuning.staleClaimMs : Infinity];
    return new Date(Math.max(deps.clock().getTime(), Math.min(...times)));
  }
}
