import { and, asc, eq, inArray, isNull, sql } from 'drizzle-orm';
import Papa from 'papaparse';
import * as z from 'zod';
import { EQUIPMENT_KINDS, EQUIPMENT_KIND_LABELS, type EquipmentKind } from '../../shared/equipment';
import {
  emailSchema,
  IMPORT_FIELDS,
  nameSchema,
  phoneSchema,
  propertyInputSchema,
  type ImportCheck,
  type ImportCounts,
  type ImportFieldKey,
  type ImportMapping,
  type ImportPreview,
  type ImportProblem,
} from '../../shared/schemas/customers';
import { equipmentInputSchema, type EquipmentInput } from '../../shared/schemas/equipment';
import type { Tx } from '../db/client';
import { customers, equipment, properties } from '../db/schema';
import { AppError } from '../http/errors';
import type { AppDeps } from '../deps';
import { companyToday } from '../company/company';
import { insertImportedCustomer, insertImportedProperty } from '../customers/import-rows';
import { insertImportedEquipment } from '../equipment/equipment.service';

export const MAX_IMPORT_ROWS = 20_000;

// ---- Reading the file ----

export interface CsvTable {
  headers: string[];
  rows: Record<string, string>[];
}

/** Parses CSV text (UTF-8, optional BOM) with a header row; refuses files that are not a table. */
/** Undoes the export's formula escaping (server/http/csv.ts), so an exported file imports back as it was. */
const unguard = (v: string) => (/^'[=+\-@\t\r]/.test(v) ? v.slice(1) : v);

export function readCsv(buf: Buffer): CsvTable {
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(buf);
  } catch {
    throw new AppError(415, 'not_text', 'That file is not a UTF-8 text CSV. Save it from your spreadsheet as "CSV UTF-8".');
  }
  if (text.includes('\u0000')) throw new AppError(415, 'not_text', 'That file is not a CSV text file.');
  const parsed = Papa.parse<Record<string, string>>(text.replace(/^\uFEFF/, ''), { header: true, skipEmptyLines: 'greedy', transformHeader: (h) => h.trim() });
  const headers = (parsed.meta.fields ?? []).filter((h) => h !== '');
  if (!headers.length) throw new AppError(422, 'validation_failed', 'Please check file.', { file: 'The file has no header row.' });
  if (new Set(headers).size !== headers.length)
    throw new AppError(422, 'validation_failed', 'Please check file.', { file: 'Two columns have the same heading; give each a different name.' });
  if (parsed.data.length > MAX_IMPORT_ROWS) throw new AppError(413, 'too_many_rows', `Import at most ${MAX_IMPORT_ROWS} rows at a time.`);
  const rows = parsed.data.map((r) => Object.fromEntries(headers.map((h) => [h, unguard(String(r[h] ?? '').trim())])));
  return { headers, rows };
}

const norm = (s: string) =>
  s
    .toLowerCase()
    .replace(/[^a-z0-9/]+/g, ' ')
    .trim();

/** Our best guess at which column holds which field, from headings and their common variants. */
export function suggestMapping(headers: string[]): ImportMapping {
  const mapping: ImportMapping = {};
  const used = new Set<string>();
  for (const f of IMPORT_FIELDS) {
    const names = [f.key.replace(/_/g, ' '), f.label, ...f.aliases].map(norm);
    const hit = headers.find((h) => !used.has(h) && names.includes(norm(h)));
    mapping[f.key] = hit ?? null;
    if (hit) used.add(hit);
  }
  return mapping;
}

export function previewCsv(buf: Buffer): ImportPreview {
  const { headers, rows } = readCsv(buf);
  return { headers, sample: rows.slice(0, 5), rowCount: rows.length, mapping: suggestMapping(headers) };
}

// ---- Checking rows ----

const kindByWord = new Map<string, EquipmentKind>();
for (const k of EQUIPMENT_KINDS) {
  kindByWord.set(norm(k.replace(/_/g, ' ')), k);
  kindByWord.set(norm(EQUIPMENT_KIND_LABELS[k]), k);
}
for (const [word, k] of [
  ['ac', 'condensing_unit'],
  ['air conditioner', 'condensing_unit'],
  ['condenser', 'condensing_unit'],
  ['furnace', 'gas_furnace'],
  ['fan coil', 'air_handler'],
  ['geothermal', 'geothermal_heat_pump'],
  ['water source heat pump', 'geothermal_heat_pump'],
  ['mini split', 'ductless'],
] as const)
  kindByWord.set(word, k);

interface RowValue {
  row: number;
  customer: { name: string; email: string | null; phone: string | null };
  property: z.infer<typeof propertyInputSchema>;
  equipment: EquipmentInput | null;
}

const customerRowSchema = z
  .object({
    name: nameSchema,
    email: z.preprocess((v) => (v === '' ? null : v), emailSchema.nullable()),
    phone: z.preprocess((v) => (v === '' ? null : v), phoneSchema.nullable()),
  })
  .refine((c) => c.email !== null || c.phone !== null, { error: 'Give an e-mail address or a phone number.', path: ['email'] });

const customerFieldOf: Record<string, ImportFieldKey> = { name: 'customer_name', email: 'customer_email', phone: 'customer_phone' };
const propertyFieldOf: Record<string, ImportFieldKey> = { label: 'property_label', street: 'street', unit: 'unit', city: 'city', state: 'state', zip: 'zip' };
const equipmentFieldOf: Record<string, ImportFieldKey> = {
  kind: 'equipment_kind',
  make: 'make',
  model: 'model',
  serial: 'serial',
  installedOn: 'installed_on',
  refrigerant: 'refrigerant',
  capacity: 'capacity_btuh',
  volts: 'volts',
  phase: 'phase',
  ratedAmps: 'rated_amps',
  filterSize: 'filter_size',
  filterType: 'filter_type',
  merv: 'merv',
  warrantyEndsOn: 'warranty_ends_on',
  location: 'location',
};

/** Dates as people type them in spreadsheets: 2019-06-30, 6/30/2019. */
function isoFromSheet(v: string): string {
  const us = /^(\d{1,2})\/(\d{1,2})\/(\d{4})$/.exec(v);
  return us ? `${us[3]}-${us[1]!.padStart(2, '0')}-${us[2]!.padStart(2, '0')}` : v;
}

export function checkRows(table: CsvTable, mapping: ImportMapping, today: string): { values: RowValue[]; problems: ImportProblem[] } {
  const problems: ImportProblem[] = [];
  const values: RowValue[] = [];
  const columnOf = (field: ImportFieldKey) => mapping[field] ?? field;
  const get = (r: Record<string, string>, field: ImportFieldKey) => {
    const col = mapping[field];
    return col ? (r[col] ?? '') : '';
  };
  table.rows.forEach((r, i) => {
    const row = i + 2;
    const before = problems.length;
    const add = (field: ImportFieldKey | '_', message: string) => problems.push({ row, column: field === '_' ? '' : columnOf(field), field, message });
    const report = (err: z.ZodError, fieldOf: Record<string, ImportFieldKey>) => {
      const seen = new Set<string>();
      for (const issue of err.issues) {
        const key = String(issue.path[0] ?? '');
        const field = fieldOf[key] ?? '_';
        if (seen.has(field)) continue;
        seen.add(field);
        add(field, issue.message);
      }
    };

    const c = customerRowSchema.safeParse({ name: get(r, 'customer_name'), email: get(r, 'customer_email'), phone: get(r, 'customer_phone') });
    if (!c.success) report(c.error, customerFieldOf);
    const p = propertyInputSchema.safeParse({
      label: get(r, 'property_label'),
      street: get(r, 'street'),
      unit: get(r, 'unit'),
      city: get(r, 'city'),
      state: get(r, 'state'),
      zip: get(r, 'zip'),
    });
    if (!p.success) report(p.error, propertyFieldOf);

    let e: EquipmentInput | null = null;
    const kindText = get(r, 'equipment_kind');
    const anyEquipment = IMPORT_FIELDS.some((f) => f.part === 'equipment' && get(r, f.key) !== '');
    if (anyEquipment) {
      const kind = kindByWord.get(norm(kindText));
      if (!kindText) add('equipment_kind', 'Give the equipment kind, or leave all equipment columns empty.');
      else if (!kind) add('equipment_kind', `"${kindText}" is not a kind we know; use one of: ${EQUIPMENT_KINDS.map((k) => EQUIPMENT_KIND_LABELS[k]).join(', ')}.`);
      const tons = get(r, 'capacity_tons');
      const btuh = get(r, 'capacity_btuh');
      const parsed = equipmentInputSchema.safeParse({
        kind: kind ?? 'thermostat',
        make: get(r, 'make'),
        model: get(r, 'model'),
        serial: get(r, 'serial'),
        installedOn: isoFromSheet(get(r, 'installed_on')),
        refrigerant: get(r, 'refrigerant'),
        capacity: btuh !== '' ? btuh : tons,
        capacityUnit: btuh !== '' || tons === '' ? 'btuh' : 'tons',
        volts: get(r, 'volts'),
        phase: get(r, 'phase'),
        ratedAmps: get(r, 'rated_amps'),
        filterSize: get(r, 'filter_size'),
        filterType: get(r, 'filter_type'),
        merv: get(r, 'merv'),
        warrantyEndsOn: isoFromSheet(get(r, 'warranty_ends_on')),
        location: get(r, 'location'),
      });
      if (!parsed.success) {
        const fieldOf = btuh === '' && tons !== '' ? { ...equipmentFieldOf, capacity: 'capacity_tons' as const } : equipmentFieldOf;
        report(parsed.error, fieldOf);
      } else if (kind) {
        e = { ...parsed.data, kind };
        if (e.installedOn && e.installedOn > today) add('installed_on', 'Install date cannot be after today.');
      }
    }
    if (problems.length === before && c.success && p.success) values.push({ row, customer: c.data, property: p.data, equipment: e });
  });
  return { values, problems };
}

// ---- Matching and writing ----

// USPS Publication 28 street suffix and directional abbreviations (common ones).
const ABBREVIATIONS: Record<string, string> = {
  street: 'st',
  avenue: 'ave',
  drive: 'dr',
  road: 'rd',
  lane: 'ln',
  court: 'ct',
  circle: 'cir',
  boulevard: 'blvd',
  place: 'pl',
  terrace: 'ter',
  parkway: 'pkwy',
  highway: 'hwy',
  trail: 'trl',
  square: 'sq',
  hollow: 'holw',
  path: 'path',
  way: 'way',
  north: 'n',
  south: 's',
  east: 'e',
  west: 'w',
  northeast: 'ne',
  northwest: 'nw',
  southeast: 'se',
  southwest: 'sw',
};

/** One key per address, so "12 Kestrel Street" and "12 kestrel st." are the same house. */
export function addressKey(street: string, unit: string | null, zip: string): string {
  const words = (s: string) =>
    s
      .toLowerCase()
      .replace(/[.,#]/g, ' ')
      .split(/\s+/)
      .filter(Boolean)
      .map((w) => ABBREVIATIONS[w] ?? w)
      .join(' ');
  return `${words(street)}|${words(unit ?? '')}|${zip.slice(0, 5)}`;
}

const equipmentKey = (e: { kind: string; serial: string; make: string; model: string; installedOn: string | null }) =>
  e.serial.trim() ? `${e.kind}|s:${e.serial.trim().toLowerCase()}` : `${e.kind}|m:${e.make.trim().toLowerCase()}|${e.model.trim().toLowerCase()}|${e.installedOn ?? ''}`;

const emptyCounts = (): ImportCounts => ({ customers: { created: 0, matched: 0 }, properties: { created: 0, matched: 0 }, equipment: { created: 0, matched: 0 } });

/**
 * Writes the rows, matching existing records so a second import of the same file adds nothing:
 * a household by e-mail, or else by an address it already has; a property by address within the
 * household; equipment by kind and serial (or kind, make, model and install date without one).
 */
async function writeRows(tx: Tx, values: RowValue[]): Promise<ImportCounts> {
  const counts = emptyCounts();
  const emails = [...new Set(values.map((v) => v.customer.email).filter((e): e is string => !!e))];
  const zips = [...new Set(values.map((v) => v.property.zip.slice(0, 5)))];
  const byEmail = new Map<string, string>();
  if (emails.length) {
    const rows = await tx
      .select({ id: customers.id, email: customers.email })
      .from(customers)
      .where(and(isNull(customers.archivedAt), inArray(sql`lower(${customers.email})`, emails)));
    for (const r of rows) byEmail.set(r.email!.toLowerCase(), r.id);
  }
  const byAddress = new Map<string, { propertyId: string; customerId: string }>();
  if (zips.length) {
    const rows = await tx
      .select({ id: properties.id, customerId: properties.customerId, street: properties.street, unit: properties.unit, zip: properties.zip })
      .from(properties)
      .innerJoin(customers, eq(customers.id, properties.customerId))
      .where(and(isNull(properties.archivedAt), isNull(customers.archivedAt), inArray(sql`left(${properties.zip}, 5)`, zips)))
      .orderBy(asc(properties.createdAt));
    for (const r of rows) {
      const key = addressKey(r.street, r.unit, r.zip);
      if (!byAddress.has(key)) byAddress.set(key, { propertyId: r.id, customerId: r.customerId });
    }
  }
  const equipmentSeen = new Map<string, Set<string>>();
  const equipmentAt = async (propertyId: string) => {
    let set = equipmentSeen.get(propertyId);
    if (!set) {
      const rows = await tx.select().from(equipment).where(eq(equipment.propertyId, propertyId));
      set = new Set(rows.map(equipmentKey));
      equipmentSeen.set(propertyId, set);
    }
    return set;
  };
  const countedCustomers = new Set<string>();
  const countedProperties = new Set<string>();

  for (const v of values) {
    const address = addressKey(v.property.street, v.property.unit, v.property.zip);
    let customerId = (v.customer.email && byEmail.get(v.customer.email)) || byAddress.get(address)?.customerId;
    if (!customerId) {
      customerId = await insertImportedCustomer(tx, v.customer);
      counts.customers.created++;
      countedCustomers.add(customerId);
    } else if (!countedCustomers.has(customerId)) {
      counts.customers.matched++;
      countedCustomers.add(customerId);
    }
    if (v.customer.email) byEmail.set(v.customer.email, customerId);

    const existing = byAddress.get(address);
    let propertyId = existing && existing.customerId === customerId ? existing.propertyId : undefined;
    if (!propertyId) {
      propertyId = await insertImportedProperty(tx, customerId, v.property);
      byAddress.set(address, { propertyId, customerId });
      counts.properties.created++;
      countedProperties.add(propertyId);
    } else if (!countedProperties.has(propertyId)) {
      counts.properties.matched++;
      countedProperties.add(propertyId);
    }

    if (v.equipment) {
      const seen = await equipmentAt(propertyId);
      const key = equipmentKey(v.equipment);
      if (seen.has(key)) counts.equipment.matched++;
      else {
        await insertImportedEquipment(tx, propertyId, v.equipment);
        seen.add(key);
        counts.equipment.created++;
      }
    }
  }
  return counts;
}

class DryRun extends Error {
  constructor(readonly counts: ImportCounts) {
    super('dry run');
  }
}

/** Checks a file and, when every row is good, works out what an import would do (then rolls back). */
export async function checkImport(deps: Pick<AppDeps, 'database' | 'clock'>, buf: Buffer, mapping: ImportMapping): Promise<ImportCheck> {
  const { db } = deps.database;
  const today = await companyToday(deps);
  const table = readCsv(buf);
  const { values, problems } = checkRows(table, mapping, today);
  if (problems.length) return { valid: false, rowCount: table.rows.length, problems, counts: null };
  try {
    await db.transaction(async (tx) => {
      throw new DryRun(await writeRows(tx, values));
    });
  } catch (err) {
    if (err instanceof DryRun) return { valid: true, rowCount: table.rows.length, problems: [], counts: err.counts };
    throw err;
  }
  return { valid: true, rowCount: table.rows.length, problems: [], counts: emptyCounts() };
}

/** Imports every row or none: any bad row answers 422 with each problem by row and column. */
export async function runImport(deps: Pick<AppDeps, 'database' | 'clock'>, buf: Buffer, mapping: ImportMapping): Promise<{ rowCount: number; counts: ImportCounts }> {
  const { db } = deps.database;
  const today = await companyToday(deps);
  const table = readCsv(buf);
  const { values, problems } = checkRows(table, mapping, today);
  if (problems.length) {
    const fields: Record<string, string> = {};
    for (const p of problems) fields[`row ${p.row}: ${p.column || 'row'}`] ??= p.message;
    const rows = new Set(problems.map((p) => p.row)).size;
    throw new AppError(422, 'import_invalid', `${rows} row${rows === 1 ? ' has' : 's have'} problems; nothing was imported.`, fields);
  }
  // One import at a time: two concurrent imports of the same file must not both create a household.
  const counts = await db.transaction(async (tx) => {
    await tx.execute(sql`select pg_advisory_xact_lock(7311401)`);
    return writeRows(tx, values);
  });
  return { rowCount: table.rows.length, counts };
}
