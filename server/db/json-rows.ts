import { getTableColumns, type InferSelectModel, type Table } from 'drizzle-orm';
import { toSnakeCase } from 'drizzle-orm/casing';

/**
 * A row a statement returned as JSON (`to_json(t)`: the database's column names, JSON values),
 * read back the way drizzle reads the table's rows: the same keys and the same types (instants as
 * Date, dates as text, arrays and jsonb as themselves). Lets one statement bring several tables.
 */
export function fromJsonRow<T extends Table>(table: T, json: Record<string, unknown>): InferSelectModel<T> {
  const out: Record<string, unknown> = {};
  for (const [key, column] of Object.entries(getTableColumns(table))) {
    // Columns declared without a name take theirs from the key, in snake_case (the client's casing).
    const value = json[column.keyAsName ? toSnakeCase(key) : column.name];
    out[key] = value === null || value === undefined ? null : column.mapFromDriverValue(value);
  }
  return out as InferSelectModel<T>;
}
