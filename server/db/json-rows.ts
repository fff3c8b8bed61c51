import { getTableColumns, type InferSelectModel, type Table } from 'drizzle-orm';
import { toSnakeCase } from 'drizzle-orm/casing';

/**
 * A row a statement returned as JSON (`to_json(t)`: the database's column names, JSON values),
 * read back the way drizzle reads the table's rows: the same keys and the same types (instants as
 * Date, dates as text, arrays and jsonb as themselves). Lets one statement bring several tables.
 */
export function fromJsonRow<T extends Table>(table: T, json: Record<string, unknown>): InferSelectModel<T> {
  const out: Record<string, unknown> = {};
  for (const [key, name, column] of columnsOf(table)) {
    const value = json[name];
    out[key] = value === null || value === undefined ? null : column.mapFromDriverValue(value);
  }
  return out as InferSelectModel<T>;
}

type ColumnOf = ReturnType<typeof getTableColumns>[string];
const columnLists = new WeakMap<Table, [key: string, name: string, column: ColumnOf][]>();

/** Each column's key, its name in the JSON and the column, worked out once per table. */
function columnsOf(table: Table): [string, string, ColumnOf][] {
  let list = columnLists.get(table);
  if (!list) {
    // Columns declared without a name take theirs from the key, in snake_case (the client's casing).
    list = Object.entries(getTableColumns(table)).map(([key, column]) => [key, column.keyAsName ? toSnakeCase(key) : column.name, column]);
    columnLists.set(table, list);
  }
  return list;
}
