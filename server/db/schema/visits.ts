import { sql } from 'drizzle-orm';
import { boolean, check, index, integer, pgTable, text, uuid } from 'drizzle-orm/pg-core';
import { VISIT_KINDS, VISIT_REASONS, VISIT_STATUSES } from '../../../shared/visits';
import { createdAt, id, inList, tstz, updatedAt } from './columns';
import { customers, properties } from './customers';
import { agreements } from './agreements';
import { technicians } from './technicians';

// A visit: a tune-up or a service call at a property. Overlap per technician is refused by an
// EXCLUDE constraint written in a custom migration.
export const visits = pgTable(
  'visits',
  {
    id: id(),
    customerId: uuid()
      .notNull()
      .references(() => customers.id, { onDelete: 'restrict' }),
    propertyId: uuid()
      .notNull()
      .references(() => properties.id, { onDelete: 'restrict' }),
    agreementId: uuid().references(() => agreements.id, { onDelete: 'restrict' }),
    technicianId: uuid().references(() => technicians.id, { onDelete: 'restrict' }),
    kind: text({ enum: VISIT_KINDS }).notNull(),
    reason: text({ enum: VISIT_REASONS }).notNull(),
    status: text({ enum: VISIT_STATUSES }).notNull(),
    windowStart: tstz().notNull(),
    windowEnd: tstz().notNull(),
    startsAt: tstz().notNull(),
    endsAt: tstz().notNull(),
    symptoms: text().array().notNull().default([]),
    notes: text().notNull().default(''),
    findings: text().notNull().default(''),
    recommendations: text().notNull().default(''),
    completedAt: tstz(),
    // Closing the visit: why open checklist items were left, and the homeowner's signature for a repair.
    skippedReason: text().notNull().default(''),
    repairDone: boolean().notNull().default(false),
    signatureImage: text(),
    signedBy: text(),
    signedAt: tstz(),
    // Booked for a plan member or an urgent no-cooling/no-heat call: uses the held-back share.
    priority: boolean().notNull().default(false),
    // iCalendar SEQUENCE: raised on every change so calendars replace the earlier invitation.
    sequence: integer().notNull().default(0),
    // Upload ids of the homeowner's photos, from the upload service.
    photoIds: text().array().notNull().default([]),
    reminderSentAt: tstz(),
    // What the homeowner was last told about the assignment (technician and window), so a
    // reshuffle that changes nothing they see sends no e-mail.
    noticeSignature: text(),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    index('visits_technician_starts_idx').on(t.technicianId, t.startsAt),
    index('visits_property_idx').on(t.propertyId),
    index('visits_customer_idx').on(t.customerId),
    index('visits_starts_idx').on(t.startsAt),
    // The dispatch board: visits whose arrival window overlaps the days on screen.
    index('visits_window_idx').using('gist', sql`tstzrange(${t.windowStart}, ${t.windowEnd}, '[)')`),
    // The queue of work waiting for the office, soonest first.
    index('visits_queue_idx')
      .on(t.windowStart)
      .where(sql`status = 'requested' or (technician_id is null and status in ('scheduled', 'on_the_way', 'on_site', 'no_show'))`),
    // The reminder audience: a household's and a home's last done visit, and tune-ups booked in a season.
    index('visits_customer_done_idx')
      .on(t.customerId, t.startsAt, t.kind)
      .where(sql`status = 'done'`),
    index('visits_property_done_idx')
      .on(t.propertyId, t.startsAt)
      .where(sql`status = 'done'`),
    index('visits_tune_up_live_idx')
      .on(t.startsAt, t.customerId)
      .where(sql`kind = 'tune_up' and status not in ('canceled', 'no_show')`),
    check('visits_kind', sql.raw(`kind in (${inList(VISIT_KINDS)})`)),
    check('visits_reason', sql.raw(`reason in (${inList(VISIT_REASONS)})`)),
    check('visits_status', sql.raw(`status in (${inList(VISIT_STATUSES)})`)),
    check('visits_window', sql`${t.windowEnd} > ${t.windowStart}`),
    check('visits_work', sql`${t.endsAt} > ${t.startsAt}`),
    check('visits_sequence', sql`${t.sequence} >= 0`),
  ],
);
