import { sql } from 'drizzle-orm';
import { check, index, integer, pgTable, text, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import { REMINDER_KINDS } from '../../../shared/seasonal-reminders';
import { createdAt, id, inList, tstz } from './columns';
import { customers } from './customers';
import { users } from './users';

// A reminder campaign: one kind of reminder to the households due for it when it was created.
export const reminderCampaigns = pgTable(
  'reminder_campaigns',
  {
    id: id(),
    kind: text({ enum: REMINDER_KINDS }).notNull(),
    createdById: uuid()
      .notNull()
      .references(() => users.id, { onDelete: 'restrict' }),
    audienceCount: integer().notNull(),
    createdAt: createdAt(),
    finishedAt: tstz(),
  },
  (t) => [check('reminder_campaigns_kind', sql.raw(`kind in (${inList(REMINDER_KINDS)})`)), check('reminder_campaigns_audience', sql`${t.audienceCount} >= 0`)],
);

// One row per household per campaign: the unique key makes a retried send a no-op.
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
    kind: text({ enum: REMINDER_KINDS }).notNull(),
    email: text().notNull(),
    reason: text().notNull(),
    status: text({ enum: ['pending', 'sent', 'failed'] }).notNull().default('pending'),
    error: text(),
    sentAt: tstz(),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex('reminder_sends_campaign_customer_key').on(t.campaignId, t.customerId),
    index('reminder_sends_customer_kind_idx').on(t.customerId, t.kind, t.sentAt),
    check('reminder_sends_status', sql`${t.status} in ('pending', 'sent', 'failed')`),
  ],
);
