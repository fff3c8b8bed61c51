import { sql } from 'drizzle-orm';
import type { ReminderKind } from '../../shared/seasonal-reminders';
import type { AppDeps } from '../deps';
import { companyRow } from '../company/company';
import { isPermanent } from '../mail/outbox';
import { campaignMail, reminderMessageKey, type CampaignRecipient } from './campaign-message';

/**
 * Sending a campaign from its outbox (reminder_sends), exactly once as far as SMTP allows.
 *
 * - A batch leases its rows (claim_token, claimed_at) but leaves them 'pending'.
 * - Just before its message goes to SMTP a row turns 'sending', only if the lease is still ours;
 *   a row another worker took over (a stale lease) or the office cancelled is skipped.
 * - The moment the server accepts, the row turns 'sent', again only under our lease.
 * - A row left 'sending' by a worker that died is in doubt: SMTP may or may not hold it. Its
 *   Message-ID is fixed by the row's id, so the next worker asks the mail server whether it holds
 *   that Message-ID (`mailer.accepted`) and records it sent instead of sending it again. Where the
 *   server cannot be asked, the message is sent again and the log says it may arrive twice: the
 *   residual window is a crash between SMTP's 250 and one UPDATE.
 * - inDoubtAfterMs must exceed the transport's longest send (10 s connect + 10 s greeting + 30 s
 *   socket in createMailer), so a slow send is never taken over while it is still in flight.
 * Suppression is read at send time.
 */
export type SendDeps = Pick<AppDeps, 'config' | 'database' | 'clock' | 'mailer' | 'logger'>;

export interface SendTuning {
  /** Rows leased per batch. */
  batch: number;
  /** Messages in flight at once. */
  concurrency: number;
  /** A lease on rows not yet handed to SMTP older than this belongs to a worker that stopped. */
  staleClaimMs: number;
  /** A row left 'sending' this long is in doubt; longer than the transport's longest send. */
  inDoubtAfterMs: number;
  /** First retry delay after a temporary SMTP failure; doubles each attempt. */
  retryBaseMs: number;
  maxAttempts: number;
  /** One job works this long, then hands over to the next job. */
  budgetMs: number;
}

export const DEFAULT_TUNING: SendTuning = { batch: 200, concurrency: 4, staleClaimMs: 120_000, inDoubtAfterMs: 120_000, retryBaseMs: 30_000, maxAttempts: 6, budgetMs: 60_000 };

export type BatchOutcome = { claimed: number; sent: number; failed: number; suppressed: number; retry: number; confirmed: number };

type Claimed = {
  id: string;
  customer_id: string;
  property_id: string | null;
  email: string;
  kind: ReminderKind;
  attempts: number;
  name: string;
  claim_token: string;
  in_doubt: boolean;
};

/** Leases and sends one batch; returns what happened. Stops early when the campaign is paused or cancelled. */
export async function sendBatch(deps: SendDeps, campaignId: string, tuning: SendTuning = DEFAULT_TUNING): Promise<BatchOutcome> {
  const { db } = deps.database;
  const now = deps.clock();
  const staleBefore = new Date(now.getTime() - tuning.staleClaimMs);
  const doubtBefore = new Date(now.getTime() - tuning.inDoubtAfterMs);
  const claimed = await db.execute<Claimed>(sql`
    with picked as (
      select s.id, s.status = 'sending' as in_doubt from reminder_sends s join reminder_campaigns rc on rc.id = s.campaign_id
      where s.campaign_id = ${campaignId} and rc.status = 'sending'
        and ((s.status = 'pending' and (s.next_attempt_at is null or s.next_attempt_at <= ${now}) and (s.claimed_at is null or s.claimed_at < ${staleBefore}))
          or (s.status = 'sending' and s.claimed_at < ${doubtBefore}))
      order by s.id limit ${tuning.batch} for update of s skip locked)
    update reminder_sends rs set claim_token = gen_random_uuid(), claimed_at = ${now}
    from picked, customers c
    where rs.id = picked.id and c.id = rs.customer_id
    returning rs.id, rs.customer_id, rs.property_id, rs.email, rs.kind, rs.attempts, c.name, rs.claim_token, picked.in_doubt`);
  const out: BatchOutcome = { claimed: claimed.rows.length, sent: 0, failed: 0, suppressed: 0, retry: 0, confirmed: 0 };
  if (!claimed.rows.length) return out;

  const company = await companyRow(db);
  const emails = claimed.rows.map((r) => r.email.toLowerCase());
  const suppressed = await db.execute<{ email: string }>(
    sql`select lower(email) as email from mail_suppressions where purpose = 'reminders' and lower(email) in (select jsonb_array_elements_text(${JSON.stringify(emails)}::jsonb))`,
  );
  const off = new Set(suppressed.rows.map((r) => r.email));

  /** Moves a row out of 'sending' under our lease, with its log line; false if the lease is gone. */
  const record = async (row: Claimed, status: string, event: string, detail: string, extra = sql``, permanent = false) => {
    const r = await db.execute(sql`with u as (update reminder_sends set status = ${status}, error = ${status === 'sent' ? null : detail || null}, claim_token = null ${extra}
        where id = ${row.id} and claim_token = ${row.claim_token} and status in ('pending', 'sending') returning campaign_id, customer_id)
      insert into reminder_deliveries (campaign_id, customer_id, event, detail, permanent) select campaign_id, customer_id, ${event}, ${detail}, ${permanent} from u`);
    return (r.rowCount ?? 0) > 0;
  };
  /** The last step before SMTP: 'sending' under our lease, or false (taken over, or cancelled). */
  const begin = async (row: Claimed) => {
    const r = await db.execute(sql`update reminder_sends set status = 'sending', claimed_at = now(), attempts = attempts + 1
      where id = ${row.id} and claim_token = ${row.claim_token} and status in ('pending', 'sending')`);
    return (r.rowCount ?? 0) > 0;
  };

  let next = 0;
  let stopped = false;
  const work = async () => {
    for (;;) {
      const row = claimed.rows[next++];
      if (!row) return;
      if (stopped) {
        // Paused or cancelled mid-batch: give the lease back; a row in doubt stays in doubt, ready to be checked.
        await db.execute(sql`update reminder_sends set claim_token = null, claimed_at = case when status = 'sending' then 'epoch'::timestamptz end
          where id = ${row.id} and claim_token = ${row.claim_token}`);
        continue;
      }
      const key = reminderMessageKey(row.id);
      if (row.in_doubt) {
        const held = deps.mailer.accepted ? await deps.mailer.accepted(key) : null;
        if (held) {
          if (await record(row, 'sent', 'sent', 'Confirmed at the mail server after an interrupted send; not sent again.', sql`, sent_at = now()`)) out.confirmed++;
          continue;
        }
        if (held === null) deps.logger.warn({ sendId: row.id }, 'reminder interrupted mid-send and the mail server cannot be asked: sending again, it may arrive twice');
      }
      if (off.has(row.email.toLowerCase())) {
        await record(row, 'suppressed', 'suppressed', 'Unsubscribed: not sent.');
        out.suppressed++;
        continue;
      }
      if (!(await begin(row))) continue;
      const r: CampaignRecipient = { id: row.id, customerId: row.customer_id, propertyId: row.property_id, email: row.email, name: row.name, kind: row.kind };
      const attempts = row.attempts + 1;
      try {
        const mail = campaignMail(deps, company, r);
        const accepted = await deps.mailer.send(mail);
        const again = row.in_doubt ? 'Sent again after an interrupted send' + (deps.mailer.accepted ? '.' : ': the mail server cannot be asked, so it may arrive twice.') : '';
        await record(row, 'sent', 'sent', again || (accepted.response ?? ''), sql`, sent_at = now(), smtp_reply = ${accepted.response ?? null}`);
        out.sent++;
      } catch (err) {
        const message = ((err as Error).message ?? String(err)).slice(0, 300);
        if (isPermanent(err) || attempts >= tuning.maxAttempts) {
          await record(row, 'failed', 'failed', message, sql``, isPermanent(err));
          out.failed++;
        } else {
          const at = new Date(deps.clock().getTime() + tuning.retryBaseMs * 2 ** (attempts - 1));
          await record(row, 'pending', 'retry', message, sql`, next_attempt_at = ${at}, claimed_at = null`);
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
      await db.execute<{ status: string; open: number; next_at: string | null; stale_at: string | null; doubt_at: string | null }>(sql`
        select rc.status,
          (select count(*)::int from reminder_sends s where s.campaign_id = rc.id and s.status in ('pending', 'sending')) as open,
          (select min(s.next_attempt_at)::text from reminder_sends s where s.campaign_id = rc.id and s.status = 'pending') as next_at,
          (select min(s.claimed_at)::text from reminder_sends s where s.campaign_id = rc.id and s.status = 'pending' and s.claimed_at is not null) as stale_at,
          (select min(s.claimed_at)::text from reminder_sends s where s.campaign_id = rc.id and s.status = 'sending') as doubt_at
        from reminder_campaigns rc where rc.id = ${campaignId}`)
    ).rows;
    if (!state || state.status !== 'sending') return 'stopped';
    if (state.open === 0) {
      await db.execute(sql`update reminder_campaigns set status = 'done', finished_at = now(), updated_at = now() where id = ${campaignId} and status = 'sending'`);
      return 'done';
    }
    const at = (t: string | null, plus: number) => (t ? new Date(t).getTime() + plus : Infinity);
    const times = [at(state.next_at, 0), at(state.stale_at, tuning.staleClaimMs), at(state.doubt_at, tuning.inDoubtAfterMs)];
    return new Date(Math.max(deps.clock().getTime(), Math.min(...times)));
  }
}
