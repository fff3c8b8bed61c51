import { eq } from 'drizzle-orm';
import type { Contact, Property, StoredFile } from '../../shared/schemas/customers';
import type { Db, Tx } from '../db/client';
import { contacts, customers, files, properties } from '../db/schema';
import { AppError, notFound } from '../http/errors';

// How customer records read in the API, shared by the customers feature's modules.

export type CustomerRow = typeof customers.$inferSelect;
export type PropertyRow = typeof properties.$inferSelect;

export const iso = (d: Date | null) => (d ? d.toISOString() : null);

export function toProperty(p: PropertyRow): Property {
  return {
    id: p.id,
    customerId: p.customerId,
    label: p.label,
    street: p.street,
    unit: p.unit,
    city: p.city,
    state: p.state,
    zip: p.zip,
    area: p.area,
    accessNotes: p.accessNotes,
    gateCode: p.gateCode,
    pets: p.pets,
    archived: p.archivedAt !== null,
  };
}

export function toFile(f: typeof files.$inferSelect): StoredFile {
  return {
    id: f.id,
    category: f.category,
    contentType: f.contentType,
    originalName: f.originalName,
    sizeBytes: f.sizeBytes,
    width: f.width,
    height: f.height,
    caption: f.caption,
    propertyId: f.propertyId,
    equipmentId: f.equipmentId,
    visitId: f.visitId,
    url: `/api/files/${f.id}`,
    thumbUrl: f.thumbKey ? `/api/files/${f.id}/thumb` : null,
    createdAt: f.createdAt.toISOString(),
  };
}

export const toContact = (c: typeof contacts.$inferSelect): Contact => ({
  id: c.id,
  name: c.name,
  relationship: c.relationship,
  email: c.email,
  phone: c.phone,
  isPrimary: c.isPrimary,
});

/** A duplicate live e-mail answers 409 naming the field, not a bare constraint name. */
export function duplicateEmail(err: unknown): never {
  const e = err as { cause?: { code?: string; constraint?: string } };
  if (e?.cause?.code === '23505' && e.cause.constraint === 'customers_live_email_key') {
    throw new AppError(409, 'duplicate', 'Another household already uses that e-mail address. Open it, or merge the two.', {
      email: 'Another household already uses this e-mail address.',
    });
  }
  throw err;
}

export async function customerRow(db: Db | Tx, id: string): Promise<CustomerRow> {
  const [c] = await db.select().from(customers).where(eq(customers.id, id)).limit(1);
  if (!c) throw notFound('That household');
  return c;
}
