import { sql } from 'drizzle-orm';
import { boolean, check, index, jsonb, pgTable, text, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import type { ReadingCheck, VisitReadings } from '../../../shared/hvac';
import { CHECKLIST_RESULTS, READING_STATUSES } from '../../../shared/schemas/field';
import { createdAt, inList, id, tstz, updatedAt } from './columns';
import { equipment } from './equipment';
import { properties } from './customers';
import { users } from './users';
import { visits } from './visits';

// One set of readings per system per visit. What the technician entered is kept as entered;
// the checks are what the server computed from it with the readings engine at save time.
export const visitReadings = pgTable(
  'visit_readings',
  {
    id: id(),
    visitId: uuid()
      .notNull()
      .references(() => visits.id, { onDelete: 'cascade' }),
    // Denormalised so a home's readings history is one index scan.
    propertyId: uuid()
      .notNull()
      .references(() => properties.id, { onDelete: 'restrict' }),
    equipmentId: uuid()
      .notNull()
      .references(() => equipment.id, { onDelete: 'restrict' }),
    readings: jsonb().$type<VisitReadings>().notNull(),
    checks: jsonb().$type<ReadingCheck[]>().notNull(),
    worstStatus: text({ enum: READING_STATUSES }),
    recordedAt: tstz().notNull().defaultNow(),
    recordedBy: uuid().references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex('visit_readings_visit_equipment_key').on(t.visitId, t.equipmentId),
    index('visit_readings_property_idx').on(t.propertyId, t.recordedAt),
    check('visit_readings_worst', sql.raw(`worst_status is null or worst_status in (${inList(READING_STATUSES)})`)),
  ],
);

// Tune-up checklist results: one row per item per piece of equipment per visit.
export const visitChecklistItems = pgTable(
  'visit_checklist_items',
  {
    id: id(),
    visitId: uuid()
      .notNull()
      .references(() => visits.id, { onDelete: 'cascade' }),
    equipmentId: uuid()
      .notNull()
      .references(() => equipment.id, { onDelete: 'restrict' }),
    itemId: text().notNull(),
    result: text({ enum: CHECKLIST_RESULTS }).notNull(),
    note: text().notNull().default(''),
    updatedAt: updatedAt(),
  },
  (t) => [
    uniqueIndex('visit_checklist_items_key').on(t.visitId, t.equipmentId, t.itemId),
    check('visit_checklist_items_result', sql.raw(`result in (${inList(CHECKLIST_RESULTS)})`)),
  ],
);

// The structured record of a no-cooling or no-heat call: what was tested, what was found, what was done.
// A null answer means "not checked".
export const visitTroubleshooting = pgTable('visit_troubleshooting', {
  visitId: uuid()
    .primaryKey()
    .references(() => visits.id, { onDelete: 'cascade' }),
  thermostatCalling: boolean(),
  controlVoltageAtRC: boolean(),
  callVoltageAtYCOutdoor: boolean(),
  callVoltageAtWC: boolean(),
  condensateSwitchTripped: boolean(),
  breakerTripped: boolean(),
  disconnectOff: boolean(),
  fuseBlown: boolean(),
  causeFound: text().notNull().default(''),
  fixMade: text().notNull().default(''),
  updatedAt: updatedAt(),
});
