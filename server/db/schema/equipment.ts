import { sql } from 'drizzle-orm';
import { check, date, doublePrecision, index, integer, pgTable, smallint, text, uuid } from 'drizzle-orm/pg-core';
import { COMPRESSOR_TYPES, EQUIPMENT_KINDS, METERING_DEVICES, REFRIGERANTS } from '../../../shared/equipment';
import { createdAt, id, inList, tstz } from './columns';
import { properties } from './customers';

// Equipment belongs to the property, not the person: it stays when the house changes hands.
export const equipment = pgTable(
  'equipment',
  {
    id: id(),
    propertyId: uuid()
      .notNull()
      .references(() => properties.id, { onDelete: 'restrict' }),
    kind: text({ enum: EQUIPMENT_KINDS }).notNull(),
    make: text().notNull().default(''),
    model: text().notNull().default(''),
    serial: text().notNull().default(''),
    installedOn: date({ mode: 'string' }),
    refrigerant: text({ enum: REFRIGERANTS }),
    meteringDevice: text({ enum: METERING_DEVICES }),
    capacityBtuh: integer(),
    volts: integer(),
    phase: smallint(),
    ratedAmps: doublePrecision(),
    filterSize: text().notNull().default(''),
    filterType: text().notNull().default(''),
    merv: smallint(),
    warrantyEndsOn: date({ mode: 'string' }),
    location: text().notNull().default(''),
    notes: text().notNull().default(''),
    compressorType: text({ enum: COMPRESSOR_TYPES }),
    /** A variable-speed unit's maximum compressor frequency, Hz (nameplate or maker's data). */
    maxCompressorHz: doublePrecision(),
    /** Nameplate or blower-table maximum total external static pressure, in. w.c. */
    maxExternalStaticInWc: doublePrecision(),
    archivedAt: tstz(),
    createdAt: createdAt(),
  },
  (t) => [
    index('equipment_property_idx').on(t.propertyId),
    // The reminder audience asks "does this home have live equipment of these kinds" per household.
    index('equipment_property_kind_live_idx')
      .on(t.propertyId, t.kind)
      .where(sql`archived_at is null`),
    check('equipment_kind', sql.raw(`kind in (${inList(EQUIPMENT_KINDS)})`)),
    check('equipment_refrigerant', sql.raw(`refrigerant is null or refrigerant in (${inList(REFRIGERANTS)})`)),
    check('equipment_metering', sql.raw(`metering_device is null or metering_device in (${inList(METERING_DEVICES)})`)),
    check('equipment_capacity', sql`${t.capacityBtuh} is null or ${t.capacityBtuh} between 1000 and 600000`),
    check('equipment_volts', sql`${t.volts} is null or ${t.volts} between 12 and 600`),
    check('equipment_phase', sql`${t.phase} is null or ${t.phase} in (1, 3)`),
    check('equipment_amps', sql`${t.ratedAmps} is null or ${t.ratedAmps} > 0`),
    check('equipment_merv', sql`${t.merv} is null or ${t.merv} between 1 and 16`),
    check('equipment_compressor_type', sql.raw(`compressor_type is null or compressor_type in (${inList(COMPRESSOR_TYPES)})`)),
    check('equipment_max_compressor_hz', sql`${t.maxCompressorHz} is null or (${t.maxCompressorHz} > 0 and ${t.maxCompressorHz} <= 300)`),
    check('equipment_max_static', sql`${t.maxExternalStaticInWc} is null or (${t.maxExternalStaticInWc} > 0 and ${t.maxExternalStaticInWc} <= 2)`),
  ],
);
