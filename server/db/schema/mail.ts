import { sql } from 'drizzle-orm';
import { check, index, integer, jsonb, pgTable, text, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import { createdAt, id, inList, tstz, updatedAt } from './columns';
import { customers } from './customers';

export const MAIL_SEND_STATUSES = ['queued', 'sending', 'retrying', 'sent', 'failed'] as const;
export type MailSendStatus = (typeof MAIL_SEND_STATUSES)[number];

/** A message as kept until it is sent: attachments' bytes as base64, so the row is plain JSON. */
export interface StoredMail {
  to: string;
  subject: string;
  text: string;
  html?: string;
  attachments?: { filename: string; contentType?: string; base64: string }[];
  headers?: Record<string, string>;
}

// Every e-mail the app sends, one row per message: the mail.send job reads the message from here,
// sends it, and records the outcome. `key` is unique, so queueing the same message twice (a retried
// job, a repeated request) never sends it twice. The body is dropped once sent: sign-in links in it
// must not outlive their delivery.
export const mailSends = pgTable(
  'mail_sends',
  {
    id: id(),
    key: text().notNull(),
    kind: text().notNull(),
    recipient: text().notNull(),
    status: text({ enum: MAIL_SEND_STATUSES }).notNull().default('queued'),
    attempts: integer().notNull().default(0),
    lastError: text(),
    message: jsonb().$type<StoredMail>(),
    messageId: text(),
    claimedAt: tstz(),
    sentAt: tstz(),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    uniqueIndex('mail_sends_key').on(t.key),
    index('mail_sends_status_idx').on(t.status, t.updatedAt),
    check('mail_sends_status', sql.raw(`status in (${inList(MAIL_SEND_STATUSES)})`)),
  ],
);

// Addresses that asked for no more mail of one purpose (reminders). Checked when such mail is
// sent; transactional mail (sign-in links, receipts, booking confirmations) never reads it.
export const mailSuppressions = pgTable(
  'mail_suppressions',
  {
    id: id(),
    email: text().notNull(),
    purpose: text().notNull(),
    customerId: uuid().references(() => customers.id, { onDelete: 'set null' }),
    source: text().notNull(),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('mail_suppressions_email_purpose_key').on(sql`lower(${t.email})`, t.purpose), check('mail_suppressions_purpose', sql`${t.purpose} in ('reminders')`)],
);
