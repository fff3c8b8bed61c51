import { asc, inArray } from 'drizzle-orm';
import { itemFromRow, rowFromItem, type PriceBookRow } from '../../shared/pricebook-csv';
import {
  PRICE_BOOK_EXPORT_COLUMNS,
  PRICE_BOOK_IMPORT_FIELDS,
  type ImportMapping,
  type ImportPreview,
  type PriceBookFieldKey,
  type PriceBookImportCheck,
  type PriceBookImportProblem,
  type PriceBookItemInput,
} from '../../shared/schemas/pricebook';
import type { AppDeps } from '../deps';
import type { Tx } from '../db/client';
import { priceBookItems } from '../db/schema';
import { AppError } from '../http/errors';
import { toCsv } from '../http/csv';
import { readCsv, type CsvTable } from '../imports/csv.service';
import { applyItemChange, insertItem, itemView } from './pricebook.service';

// CSV import and export of the price book, with the household import's flow: preview the file
// and a suggested column mapping, check every row (problems name the row and column), then
// import all or nothing. An existing SKU is updated (a new price version when a price changes).

const norm = (s: string) =>
  s
    .toLowerCase()
    .replace(/[^a-z0-9/µ]+/g, ' ')
    .trim();

export function suggestPriceBookMapping(headers: string[]): ImportMapping {
  const mapping: ImportMapping = {};
  const used = new Set<string>();
  for (const f of PRICE_BOOK_IMPORT_FIELDS) {
    const names = [f.key.replace(/_/g, ' '), f.label, ...f.aliases].map(norm);
    const hit = headers.find((h) => !used.has(h) && names.includes(norm(h)));
    mapping[f.key] = hit ?? null;
    if (hit) used.add(hit);
  }
  return mapping;
}

export function previewPriceBookCsv(buf: Buffer): ImportPreview {
  const { headers, rows } = readCsv(buf);
  return { headers, sample: rows.slice(0, 5), rowCount: rows.length, mapping: suggestPriceBookMapping(headers) };
}

function checkTable(table: CsvTable, mapping: ImportMapping): { values: PriceBookItemInput[]; problems: PriceBookImportProblem[] } {
  const problems: PriceBookImportProblem[] = [];
  for (const [key, col] of Object.entries(mapping)) {
    if (col && !table.headers.includes(col)) problems.push({ row: 1, column: col, field: key as PriceBookFieldKey, message: `The file has no column "${col}".` });
  }
  if (problems.length) return { values: [], problems };
  const values: PriceBookItemInput[] = [];
  const seen = new Map<string, number>();
  table.rows.forEach((raw, i) => {
    const rowNo = i + 2;
    const row: PriceBookRow = {};
    for (const [key, col] of Object.entries(mapping)) if (col) row[key as PriceBookFieldKey] = raw[col] ?? '';
    const r = itemFromRow(row);
    if (!r.value) {
      for (const p of r.problems) problems.push({ row: rowNo, column: (p.field !== '_' && mapping[p.field]) || p.field, field: p.field, message: p.message });
      return;
    }
    const first = seen.get(r.value.sku);
    if (first) {
      problems.push({ row: rowNo, column: mapping.sku ?? 'sku', field: 'sku', message: `SKU ${r.value.sku} is also on row ${first}.` });
      return;
    }
    seen.set(r.value.sku, rowNo);
    values.push(r.value);
  });
  return { values, problems };
}

async function counts(tx: Tx, values: PriceBookItemInput[], now: Date, write: boolean): Promise<{ created: number; updated: number; unchanged: number }> {
  const c = { created: 0, updated: 0, unchanged: 0 };
  const existing = values.length
    ? await tx
        .select()
        .from(priceBookItems)
        .where(
          inArray(
            priceBookItems.sku,
            values.map((v) => v.sku),
          ),
        )
        .for('update')
    : [];
  const bySku = new Map(existing.map((e) => [e.sku, e]));
  for (const v of values) {
    const before = bySku.get(v.sku);
    if (!before) {
      c.created++;
      if (write) await insertItem(tx, v);
      continue;
    }
    const view = itemView(before);
    const same = JSON.stringify(rowFromItem(view)) === JSON.stringify(rowFromItem({ ...v, spec: v.spec ?? null }));
    if (same) c.unchanged++;
    else {
      c.updated++;
      if (write) await applyItemChange(tx, before, v, now);
    }
  }
  return c;
}

class Rollback extends Error {}

export async function checkPriceBookImport(deps: Pick<AppDeps, 'database' | 'clock'>, buf: Buffer, mapping: ImportMapping, write = false): Promise<PriceBookImportCheck> {
  const table = readCsv(buf);
  const { values, problems } = checkTable(table, mapping);
  if (problems.length) {
    if (write) throw new AppError(422, 'import_problems', `The file has ${problems.length} problem${problems.length === 1 ? '' : 's'}; nothing was imported.`);
    return { valid: false, rowCount: table.rows.length, problems, counts: null };
  }
  let result: PriceBookImportCheck | null = null;
  try {
    await deps.database.db.transaction(async (tx) => {
      result = { valid: true, rowCount: table.rows.length, problems: [], counts: await counts(tx, values, deps.clock(), write) };
      if (!write) throw new Rollback();
    });
  } catch (err) {
    if (!(err instanceof Rollback)) throw err;
  }
  return result!;
}

export async function exportPriceBookCsv(deps: Pick<AppDeps, 'database'>): Promise<string> {
  const rows = await deps.database.db.select().from(priceBookItems).orderBy(asc(priceBookItems.sku));
  return toCsv(
    PRICE_BOOK_EXPORT_COLUMNS,
    rows.map((r) => {
      const cols = rowFromItem(itemView(r));
      return PRICE_BOOK_EXPORT_COLUMNS.map((k) => cols[k]);
    }),
  );
}
