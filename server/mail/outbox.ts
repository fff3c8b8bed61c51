import { randomUUID } from 'node:crypto';
import { and, eq, inArray, lt, or, sql } from 'drizzle-orm';
import type { Logger } from 'pino';
import type { AppDeps } from '../deps';
import type { Db, Tx } from '../db/client';
import { mailSends, type StoredMail } from '../db/schema';
import { MailDeliveryError, MailInputError, type OutgoingMail } from '../integrations/mail';

/**
 * One path for every e-mail: the caller records the message in mail_sends and queues a mail.send
 * job; the job sends it, retries with backoff when the SMTP server is away or answers "try later",
 * and records each attempt. The request that caused the mail never waits on SMTP.
 */
export const MAIL_SEND_JOB = 'mail.send';
/** First try plus retries (pg-boss retryLimit is one less). */
export const MAIL_MAX_ATTEMPTS = 6;
/** A claim older than this belongs to a worker that died mid-send; the job's retry may take it over. */
const STALE_CLAIM_MS = 2 * 60_000;

export type OutboxDeps = Pick<AppDeps, 'database' | 'mailer' | 'jobs' | 'logger' | 'clock'>;

export interface MailToQueue {
  /** What the mail is, for the record: 'sign_in_link', 'visit_reminder', … */
  kind: string;
  message: Omit<OutgoingMail, 'idempotencyKey' | 'list' | 'to'> & { to: string };
  /**
   * Set it when the caller itself may run again for the same mail (a retried job, a repeated
   * completion): a second message with the same key is not queued. Left out, every call is a new
   * mail. Also fixes the Message-ID, so a duplicate is recognisable downstream.
   */
  key?: string;
}

function toStored(message: MailToQueue['message']): StoredMail {
  return {
    to: message.to,
    subject: message.subject,
    text: message.text,
    ...(message.html !== undefined ? { html: message.html } : {}),
    ...(message.headers ? { headers: message.headers } : {}),
    ...(message.attachments?.length
      ? {
          attachments: message.attachments.map((a) => ({
            filename: a.filename,
            ...(a.contentType ? { contentType: a.contentType } : {}),
            base64: Buffer.from(typeof a.content === 'string' ? Buffer.from(a.content, 'utf8') : a.content).toString('base64'),
          })),
        }
      : {}),
  };
}

function fromStored(stored: StoredMail, key: string): OutgoingMail {
  return {
    to: stored.to,
    subject: stored.subject,
    text: stored.text,
    ...(stored.html !== undefined ? { html: stored.html } : {}),
    ...(stored.headers ? { headers: stored.headers } : {}),
    ...(stored.attachments ? { attachments: stored.attachments.map((a) => ({ filename: a.filename, contentType: a.contentType, content: Buffer.from(a.base64, 'base64') })) } : {}),
    idempotencyKey: key,
  };
}

/**
 * Records the mail; returns its id, or null when it was already queued under the same key.
 * Inside a transaction (`tx`), call startSending() after the commit.
 */
export async function recordMail(deps: Pick<OutboxDeps, 'database'>, mail: MailToQueue, tx?: Tx): Promise<string | null> {
  const db: Db | Tx = tx ?? deps.database.db;
  const [row] = await db
    .insert(mailSends)
    .values({ key: mail.key ?? `${mail.kind}:${randomUUID()}`, kind: mail.kind, recipient: mail.message.to, message: toStored(mail.message) })
    .onConflictDoNothing({ target: mailSends.key })
    .returning({ id: mailSends.id });
  return row?.id ?? null;
}

/** Hands recorded mails to the job queue, which sends, retries and records them. */
export async function startSending(deps: Pick<OutboxDeps, 'jobs'>, ids: (string | null)[]): Promise<void> {
  for (const id of ids) if (id) await deps.jobs.send(MAIL_SEND_JOB, { id });
}

/** Records the mail and queues its sending; true when a new mail was queued. */
export async function queueMail(deps: OutboxDeps, mail: MailToQueue): Promise<boolean> {
  const id = await recordMail(deps, mail);
  await startSending(deps, [id]);
  return id !== null;
}

/** SMTP 5xx replies are permanent (RFC 5321 section 4.2.1); bad input never gets better either. */
export function isPermanent(err: unknown): boolean {
  if (err instanceof MailInputError) return true;
  return err instanceof MailDeliveryError && err.responseCode !== undefined && err.responseCode >= 500 && err.responseCode < 600;
}

export type DeliveryOutcome = 'sent' | 'skipped' | 'failed';

/**
 * The mail.send job: claims the row, sends, records. A row already sent (or being sent by a live
 * worker) is skipped, so a job that runs twice sends once. Throws on a failure worth retrying, so
 * pg-boss retries the job.
 */
export async function deliverMail(deps: OutboxDeps, id: string, log: Pick<Logger, 'info' | 'warn' | 'error'> = deps.logger): Promise<DeliveryOutcome> {
  const { db } = deps.database;
  const now = deps.clock();
  const [row] = await db
    .update(mailSends)
    .set({ status: 'sending', attempts: sql`${mailSends.attempts} + 1`, claimedAt: now, updatedAt: now })
    .where(
      and(
        eq(mailSends.id, id),
        or(inArray(mailSends.status, ['queued', 'retrying']), and(eq(mailSends.status, 'sending'), lt(mailSends.claimedAt, new Date(now.getTime() - STALE_CLAIM_MS)))),
      ),
    )
    .returning();
  if (!row) {
    const [current] = await db.select({ status: mailSends.status }).from(mailSends).where(eq(mailSends.id, id));
    // Claimed by a worker that may have stopped mid-send: try again later, when the claim has gone
    // stale, rather than drop the mail.
    if (current?.status === 'sending') throw new Error('the e-mail is being sent by another worker; trying again later');
    return 'skipped';
  }
  if (!row.message) {
    await db.update(mailSends).set({ status: 'failed', lastError: 'the message is missing', updatedAt: now }).where(eq(mailSends.id, id));
    return 'failed';
  }
  try {
    const info = await deps.mailer.send(fromStored(row.message, row.key));
    const sentAt = deps.clock();
    await db.update(mailSends).set({ status: 'sent', sentAt, messageId: info.messageId, message: null, lastError: null, updatedAt: sentAt }).where(eq(mailSends.id, id));
    log.info({ mailId: id, kind: row.kind, attempts: row.attempts }, 'e-mail sent');
    return 'sent';
  } catch (err) {
    const permanent = isPermanent(err);
    const lastTry = permanent || row.attempts >= MAIL_MAX_ATTEMPTS;
    // MailDeliveryError carries no body text, so the error is safe to keep and to log.
    const message = (err as Error).message ?? String(err);
    await db
      .update(mailSends)
      .set({ status: lastTry ? 'failed' : 'retrying', lastError: message.slice(0, 1000), updatedAt: deps.clock() })
      .where(eq(mailSends.id, id));
    log[lastTry ? 'error' : 'warn']({ mailId: id, kind: row.kind, attempts: row.attempts, err: message }, lastTry ? 'e-mail failed for good' : 'e-mail failed; will retry');
    if (lastTry) return 'failed';
    throw err;
  }
}

/**
 * Queues again what is stuck: a row still queued, retrying or sending long after its last change
 * (its job was lost: the queue was down at the moment of queueing, or a worker died mid-send and
 * its job ran out of retries). A job that is merely waiting finds the row taken and skips.
 */
export async function requeueStuckMail(deps: OutboxDeps, olderThanMs = 30 * 60_000): Promise<number> {
  const before = new Date(deps.clock().getTime() - olderThanMs);
  const rows = await deps.database.db
    .select({ id: mailSends.id })
    .from(mailSends)
    .where(and(inArray(mailSends.status, ['queued', 'retrying', 'sending']), lt(mailSends.updatedAt, before), lt(mailSends.attempts, MAIL_MAX_ATTEMPTS)))
    .limit(500);
  await startSending(
    deps,
    rows.map((r) => r.id),
  );
  return rows.length;
}
