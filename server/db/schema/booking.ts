import { sql } from 'drizzle-orm';
import { bigint, check, index, integer, pgTable, smallint, text, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import { VISIT_STATUSES } from '../../../shared/visits';
import { createdAt, id, inList, tstz, updatedAt } from './columns';
import { technicians } from './technicians';
import { users } from './users';
import { visits } from './visits';

export const VISIT_EVENT_ACTIONS = ['booked', 'assigned', 'rescheduled', 'status', 'canceled'] as const;
export type VisitEventAction = (typeof VISIT_EVENT_ACTIONS)[number];

// Every change to a visit, with who made it and when: the dispatch history.
export const visitEvents = pgTable(
  'visit_events',
  {
    id: id(),
    visitId: uuid()
      .notNull()
      .references(() => visits.id, { onDelete: 'cascade' }),
    at: tstz().notNull().defaultNow(),
    actorUserId: uuid().references(() => users.id, { onDelete: 'set null' }),
    action: text({ enum: VISIT_EVENT_ACTIONS }).notNull(),
    fromStatus: text({ enum: VISIT_STATUSES }),
    toStatus: text({ enum: VISIT_STATUSES }).notNull(),
    technicianId: uuid().references(() => technicians.id, { onDelete: 'set null' }),
    note: text().notNull().default(''),
  },
  (t) => [index('visit_events_visit_idx').on(t.visitId, t.at), check('visit_events_action', sql.raw(`action in (${inList(VISIT_EVENT_ACTIONS)})`))],
);

// Days or hours a technician is not available (vacation, training, sick).
export const technicianTimeOff = pgTable(
  'technician_time_off',
  {
    id: id(),
    technicianId: uuid()
      .notNull()
      .references(() => technicians.id, { onDelete: 'cascade' }),
    startsAt: tstz().notNull(),
    endsAt: tstz().notNull(),
    reason: text().notNull().default(''),
    createdAt: createdAt(),
  },
  (t) => [index('technician_time_off_tech_idx').on(t.technicianId, t.startsAt), check('technician_time_off_span', sql`${t.endsAt} > ${t.startsAt}`)],
);

// Private calendar feed links; only the sha-256 of the token is kept, and revoking ends the link.
export const calendarFeedTokens = pgTable(
  'calendar_feed_tokens',
  {
    id: id(),
    technicianId: uuid()
      .notNull()
      .references(() => technicians.id, { onDelete: 'cascade' }),
    tokenHash: text().notNull(),
    createdAt: createdAt(),
    revokedAt: tstz(),
  },
  (t) => [
    uniqueIndex('calendar_feed_tokens_hash_key').on(t.tokenHash),
    // At most one live link per technician.
    uniqueIndex('calendar_feed_tokens_live_key')
      .on(t.technicianId)
      .where(sql`${t.revokedAt} is null`),
  ],
);

// Booking settings beyond the company row; a missing row means the defaults below.
export const bookingSettings = pgTable(
  'booking_settings',
  {
    id: smallint().primaryKey().default(1),
    travelBufferMinutes: integer().notNull().default(30),
    tuneUpMinutes: integer().notNull().default(90),
    serviceCallMinutes: integer().notNull().default(120),
    updatedAt: updatedAt(),
  },
  (t) => [
    check('booking_settings_single_row', sql`${t.id} = 1`),
    check('booking_settings_buffer', sql`${t.travelBufferMinutes} between 0 and 240`),
    check('booking_settings_minutes', sql`${t.tuneUpMinutes} between 15 and 720 and ${t.serviceCallMinutes} between 15 and 720`),
  ],
);

// The schedule's version: triggers bump it in the same transaction as every write that changes who is
// free when (visits, technicians and their time off, booking settings, company hours), so a process
// may keep what it derived from the schedule for as long as the version it read stays current.
export const scheduleVersion = pgTable(
  'schedule_version',
  {
    id: smallint().primaryKey().default(1),
    version: bigint({ mode: 'number' }).notNull().default(0),
  },
  (t) => [check('schedule_version_single_row', sql`${t.id} = 1`)],
);

// The dispatch board's version: triggers bump it once per transaction, at commit, for every write
// the board shows (visits, households and their homes, agreements and plan names, technicians, their
// time off and names, the company), so a process may keep a board while the version stays the same.
export const boardVersion = pgTable(
  'board_version',
  {
    id: smallint().primaryKey().default(1),
    version: bigint({ mode: 'number' }).notNull().default(0),
  },
  (t) => [check('board_version_single_row', sql`${t.id} = 1`)],
);
