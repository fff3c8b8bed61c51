import { eq, sql } from 'drizzle-orm';
import type { SessionUser } from '../../shared/schemas/session';
import type { Tx } from '../db/client';
import { contacts, customerNotes, customers } from '../db/schema';
import { AppError, conflict, notFound } from '../http/errors';
import type { AppDeps } from '../deps';
import { customerRow } from './customer-views';

// ---- Merge ----

interface ForeignKey {
  table: string;
  column: string;
}

/** Every single-column foreign key that points at customers.id, whichever feature owns the table. */
async function customerReferences(tx: Tx): Promise<ForeignKey[]> {
  const res = await tx.execute<{ table: string; column: string }>(sql`
    select cl.relname as table, a.attname as column
    from pg_constraint c
    join pg_class cl on cl.oid = c.conrelid
    join pg_namespace n on n.oid = cl.relnamespace and n.nspname = current_schema()
    join pg_attribute a on a.attrelid = c.conrelid and a.attnum = c.conkey[1]
    where c.contype = 'f' and c.confrelid = 'customers'::regclass and array_length(c.conkey, 1) = 1
    order by cl.relname, a.attname`);
  return res.rows.filter((r) => !(r.table === 'customers' && r.column === 'merged_into_id'));
}

export interface MergeResult {
  targetId: string;
  sourceId: string;
  moved: Record<string, number>;
  /** Rows that could not move because the target already has its own (one-per-household rows). */
  keptOnSource: string[];
}

/**
 * Moves every record of the duplicate (source) onto the kept household (target), in one
 * transaction: properties with their equipment, agreements, visits, invoices, contacts, notes,
 * files and portal sign-ins. The source is archived and points at the target.
 */
export async function mergeCustomers(deps: Pick<AppDeps, 'database' | 'clock'>, targetId: string, sourceId: string, user: SessionUser): Promise<MergeResult> {
  const { db } = deps.database;
  const now = deps.clock();
  if (targetId === sourceId) throw new AppError(422, 'validation_failed', 'Please check sourceId.', { sourceId: 'Choose a different household to merge in.' });
  return db.transaction(async (tx) => {
    // Lock both in a fixed order so two merges of the same pair cannot deadlock.
    const locked = await tx.execute<{ id: string }>(sql`select id from customers where id in (${targetId}, ${sourceId}) order by id for update`);
    if (locked.rows.length !== 2) throw notFound('That household');
    const target = await customerRow(tx, targetId);
    const source = await customerRow(tx, sourceId);
    if (target.archivedAt) throw conflict('The household you keep is archived; restore it first.');
    if (source.mergedIntoId) throw conflict('That household was already merged.');

    const moved: Record<string, number> = {};
    const keptOnSource: string[] = [];
    for (const fk of await customerReferences(tx)) {
      const table = sql.identifier(fk.table);
      const column = sql.identifier(fk.column);
      try {
        const res = await tx.transaction((sp) => sp.execute(sql`update ${table} set ${column} = ${targetId} where ${column} = ${sourceId}`));
        if (res.rowCount) moved[fk.table] = (moved[fk.table] ?? 0) + res.rowCount;
      } catch (err) {
        const code = (err as { cause?: { code?: string } }).cause?.code ?? (err as { code?: string }).code;
        if (code !== '23505') throw err;
        keptOnSource.push(fk.table);
      }
    }

    // The duplicate's own details become a contact on the kept household, so none are lost.
    const sameEmail = !source.email || source.email === target.email;
    const samePhone = !source.phone || source.phone === target.phone;
    await tx.update(customers).set({ archivedAt: now, mergedIntoId: targetId, updatedAt: now }).where(eq(customers.id, sourceId));
    const fill: Partial<typeof customers.$inferInsert> = {};
    if (!target.email && source.email) fill.email = source.email;
    if (!target.phone && source.phone) fill.phone = source.phone;
    if (source.notes) fill.notes = [target.notes, source.notes].filter(Boolean).join('\n\n');
    if (Object.keys(fill).length)
      await tx
        .update(customers)
        .set({ ...fill, updatedAt: now })
        .where(eq(customers.id, targetId));
    if ((!sameEmail && fill.email === undefined) || (!samePhone && fill.phone === undefined) || source.name !== target.name) {
      await tx
        .insert(contacts)
        .values({ customerId: targetId, name: source.name, relationship: 'From merged record', email: fill.email ? null : source.email, phone: fill.phone ? null : source.phone });
    }
    await tx
      .insert(customerNotes)
      .values({ customerId: targetId, authorUserId: user.id, audience: 'office', body: `Merged the duplicate record "${source.name}" into this household.` });
    return { targetId, sourceId, moved, keptOnSource };
  });
}
