import { sql } from 'drizzle-orm';
import { boolean, check, date, index, integer, jsonb, pgTable, primaryKey, text, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import { REMINDER_KINDS } from '../../../shared/seasonal-reminders';
import { CAMPAIGN_STATUSES, REMINDER_SEND_STATUSES, type AudienceFilter } from '../../../shared/schemas/campaigns';
import { HOUSEHOLD_FACTORS } from '../../../shared/reminders';
import { createdAt, id, inList, tstz, updatedAt } from './columns';
import { customers, properties } from './customers';
import { equipment } from './equipment';
import { users } from './users';

// A reminder campaign: one kind of reminder to an audience, sent now or at a scheduled time.
export const reminderCampaigns = pgTable(
  'reminder_campaigns',
  {
    id: id(),
    kind: text({ enum: REMINDER_KINDS }).notNull(),
    createdById: uuid()
      .notNull()
      .references(() => users.id, { onDelete: 'restrict' }),
    audienceCount: integer().notNull(),
    status: text({ enum: CAMPAIGN_STATUSES }).notNull().default('draft'),
    audience: jsonb().$type<AudienceFilter>().notNull().default({}),
    scheduledAt: tstz(),
    startedAt: tstz(),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
    finishedAt: tstz(),
  },
  (t) => [
    check('reminder_campaigns_kind', sql.raw(`kind in (${inList(REMINDER_KINDS)})`)),
    check('reminder_campaigns_audience', sql`${t.audienceCount} >= 0`),
    check('reminder_campaigns_status', sql.raw(`status in (${inList(CAMPAIGN_STATUSES)})`)),
    index('reminder_campaigns_due_idx').on(t.status, t.scheduledAt),
  ],
);

// The campaign outbox: one row per household per kind, written before anything is sent and
// marked sent only once the SMTP server has accepted the message.
export const reminderSends = pgTable(
  'reminder_sends',
  {
    id: id(),
    campaignId: uuid()
      .notNull()
      .references(() => reminderCampaigns.id, { onDelete: 'cascade' }),
    customerId: uuid()
      .notNull()
      .references(() => customers.id, { onDelete: 'restrict' }),
    propertyId: uuid().references(() => properties.id, { onDelete: 'set null' }),
    kind: text({ enum: REMINDER_KINDS }).notNull(),
    email: text().notNull(),
    reason: text().notNull(),
    status: text({ enum: REMINDER_SEND_STATUSES }).notNull().default('pending'),
    attempts: integer().notNull().default(0),
    nextAttemptAt: tstz(),
    claimedAt: tstz(),
    /** The lease of the worker that holds the row: its updates count only while the token is theirs. */
    claimToken: uuid(),
    error: text(),
    /** The mail server's reply when it accepted the message. */
    smtpReply: text(),
    sentAt: tstz(),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex('reminder_sends_campaign_customer_kind_key').on(t.campaignId, t.customerId, t.kind),
    index('reminder_sends_customer_kind_idx').on(t.customerId, t.kind, t.sentAt),
    index('reminder_sends_campaign_status_idx').on(t.campaignId, t.status),
    // The resend guard: who was sent this kind recently, from the index alone.
    index('reminder_sends_sent_idx')
      .on(t.kind, t.sentAt, t.customerId)
      .where(sql`status = 'sent'`),
    check('reminder_sends_status', sql.raw(`status in (${inList(REMINDER_SEND_STATUSES)})`)),
  ],
);

// What happened to each message: one line per attempt and outcome, per campaign and household.
export const reminderDeliveries = pgTable(
  'reminder_deliveries',
  {
    id: id(),
    campaignId: uuid()
      .notNull()
      .references(() => reminderCampaigns.id, { onDelete: 'cascade' }),
    customerId: uuid()
      .notNull()
      .references(() => customers.id, { onDelete: 'cascade' }),
    event: text({ enum: ['sent', 'retry', 'failed', 'suppressed'] }).notNull(),
    detail: text().notNull().default(''),
    permanent: boolean().notNull().default(false),
    createdAt: createdAt(),
  },
  (t) => [index('reminder_deliveries_campaign_idx').on(t.campaignId, t.createdAt), index('reminder_deliveries_customer_idx').on(t.customerId, t.createdAt)],
);

// A household's answers that shorten filter intervals, and the reminders it wants by e-mail.
export const householdReminderSettings = pgTable(
  'household_reminder_settings',
  {
    customerId: uuid()
      .primaryKey()
      .references(() => customers.id, { onDelete: 'cascade' }),
    factors: text({ enum: HOUSEHOLD_FACTORS }).array().notNull().default([]),
    /** Reminder kinds this household does not want by e-mail. */
    emailOff: text({ enum: REMINDER_KINDS }).array().notNull().default([]),
    updatedAt: updatedAt(),
  },
  () => [
    check('household_reminder_factors', sql.raw(`factors <@ array[${inList(HOUSEHOLD_FACTORS)}]::text[]`)),
    check('household_reminder_email_off', sql.raw(`email_off <@ array[${inList(REMINDER_KINDS)}]::text[]`)),
  ],
);

// The homeowner's "I changed it": the latest change per filter, counted from that day.
export const filterChanges = pgTable(
  'filter_changes',
  {
    equipmentId: uuid()
      .notNull()
      .references(() => equipment.id, { onDelete: 'cascade' }),
    customerId: uuid()
      .notNull()
      .references(() => customers.id, { onDelete: 'cascade' }),
    changedOn: date({ mode: 'string' }).notNull(),
    changedAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.equipmentId] }), index('filter_changes_customer_idx').on(t.customerId)],
);
