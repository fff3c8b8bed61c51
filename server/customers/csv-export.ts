import { and, asc, eq, isNull, sql } from 'drizzle-orm';
import { EQUIPMENT_KIND_LABELS } from '../../shared/equipment';
import { IMPORT_FIELDS, type CustomerListQuery, type ImportFieldKey } from '../../shared/schemas/customers';
import { BTUH_PER_TON } from '../../shared/schemas/equipment';
import { customers, equipment, properties } from '../db/schema';
import type { AppDeps } from '../deps';
import { toCsv } from '../http/csv';
import { searchWhere } from './search';

// The households list as a CSV file, in the same columns the import reads.

export const EXPORT_LIMIT = 50_000;

/** The households of the current list view (search and sort), one row per piece of equipment. */
export async function exportCustomersCsv(deps: Pick<AppDeps, 'database'>, q: CustomerListQuery): Promise<string> {
  const { db } = deps.database;
  const where = and(q.status === 'active' ? isNull(customers.archivedAt) : q.status === 'archived' ? sql`${customers.archivedAt} is not null` : undefined, searchWhere(q.q));
  const order = { name: sql`lower(${customers.name})`, email: sql`lower(${customers.email})`, createdAt: sql`${customers.createdAt}`, city: sql`lower(${properties.city})` }[
    q.sort
  ];
  const rows = await db
    .select({ c: customers, p: properties, e: equipment })
    .from(customers)
    .leftJoin(properties, and(eq(properties.customerId, customers.id), isNull(properties.archivedAt)))
    .leftJoin(equipment, and(eq(equipment.propertyId, properties.id), isNull(equipment.archivedAt)))
    .where(where)
    .orderBy(q.dir === 'desc' ? sql`${order} desc nulls last` : sql`${order} asc nulls last`, asc(customers.id), asc(properties.createdAt), asc(equipment.createdAt))
    .limit(EXPORT_LIMIT);
  const fields = IMPORT_FIELDS.map((f) => f.key);
  const data = rows.map(({ c, p, e }) => {
    const cell: Record<ImportFieldKey, string> = {
      customer_name: c.name,
      customer_email: c.email ?? '',
      customer_phone: c.phone ?? '',
      property_label: p?.label ?? '',
      street: p?.street ?? '',
      unit: p?.unit ?? '',
      city: p?.city ?? '',
      state: p?.state ?? '',
      zip: p?.zip ?? '',
      equipment_kind: e ? EQUIPMENT_KIND_LABELS[e.kind] : '',
      make: e?.make ?? '',
      model: e?.model ?? '',
      serial: e?.serial ?? '',
      installed_on: e?.installedOn ?? '',
      refrigerant: e ? (e.refrigerant ?? 'none') : '',
      capacity_btuh: e?.capacityBtuh != null ? String(e.capacityBtuh) : '',
      capacity_tons: e?.capacityBtuh != null ? String(Math.round((e.capacityBtuh / BTUH_PER_TON) * 100) / 100) : '',
      volts: e?.volts != null ? String(e.volts) : '',
      phase: e?.phase != null ? String(e.phase) : '',
      rated_amps: e?.ratedAmps != null ? String(e.ratedAmps) : '',
      filter_size: e?.filterSize ?? '',
      filter_type: e?.filterType ?? '',
      merv: e?.merv != null ? String(e.merv) : '',
      warranty_ends_on: e?.warrantyEndsOn ?? '',
      location: e?.location ?? '',
    };
    return fields.map((f) => cell[f]);
  });
  return toCsv(fields, data);
}
