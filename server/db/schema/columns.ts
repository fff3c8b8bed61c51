import { timestamp, uuid } from 'drizzle-orm/pg-core';

// Shared column builders: uuid keys and timestamptz stamps.
export const id = () => uuid().primaryKey().defaultRandom();
export const createdAt = () => timestamp({ withTimezone: true, mode: 'date' }).notNull().defaultNow();
export const updatedAt = () => timestamp({ withTimezone: true, mode: 'date' }).notNull().defaultNow();
export const tstz = () => timestamp({ withTimezone: true, mode: 'date' });

export function inList(values: readonly string[]): string {
  return values.map((v) => `'${v.replace(/'/g, "''")}'`).join(', ');
}
