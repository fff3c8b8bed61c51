// One CSV row ↔ one price-book item. Pure: the server reads the file and maps the columns
// (as the household import does) and hands each row here; export writes rows back the same way.
import { formatHorsepower, HP_EPSILON, ITEM_CATEGORIES, ITEM_CATEGORY_KIND, type ItemCategory } from './pricebook';
import { PRICE_BOOK_EXPORT_COLUMNS, priceBookItemInputSchema, type PriceBookFieldKey, type PriceBookItem, type PriceBookItemInput, type PartSpec } from './schemas/pricebook';

export type PriceBookRow = Partial<Record<PriceBookFieldKey, string>>;

export interface RowProblem {
  field: PriceBookFieldKey | '_';
  message: string;
}

/** "$1,234.50", "1234.5", "12" → cents, exactly (no floating point); null when it is not an amount. */
export function dollarsToCents(text: string): number | null {
  const t = text.trim().replace(/^\$/, '').replace(/,/g, '');
  const m = /^(\d{1,9})(?:\.(\d{1,2}))?$/.exec(t);
  if (!m) return null;
  return Number(m[1]) * 100 + Number((m[2] ?? '').padEnd(2, '0'));
}

export function centsToDollars(cents: number): string {
  return `${Math.floor(cents / 100)}.${String(cents % 100).padStart(2, '0')}`;
}

const YES = new Set(['yes', 'y', 'true', '1', 'x']);
const NO = new Set(['no', 'n', 'false', '0', '']);
const word = (v: string | undefined) =>
  (v ?? '')
    .trim()
    .toLowerCase()
    .replace(/[\s-]+/g, '_');
const blank = (v: string | undefined) => (v ?? '').trim() === '';

/** Where a schema path lands among our columns, so a problem names the column the owner typed in. */
const SPEC_FIELD_COLUMN: Record<string, PriceBookFieldKey> = {
  application: 'application',
  horsepower: 'hp',
  volts: 'volts',
  phase: 'phase',
  rpm: 'rpm',
  speeds: 'speeds',
  rotation: 'rotation',
  rotationViewedFrom: 'rotation_viewed_from',
  frame: 'frame',
  fla: 'fla',
  taps: 'capacitor_taps',
  capacitorVolts: 'capacitor_volts',
  microfarads: 'microfarads',
  shape: 'shape',
  tolerancePct: 'tolerance',
  poles: 'poles',
  coilVolts: 'coil_volts',
  size: 'filter_size',
  merv: 'merv',
  refrigerant: 'refrigerant',
  notes: 'spec_notes',
};
const ITEM_FIELD_COLUMN: Record<string, PriceBookFieldKey> = {
  sku: 'sku',
  name: 'name',
  kind: 'kind',
  category: 'category',
  unit: 'unit',
  unitCents: 'unit_price',
  costCents: 'cost',
  taxable: 'taxable',
  partsWarrantyMonths: 'warranty_months',
  active: 'active',
};

function columnOfPath(path: readonly PropertyKey[]): PriceBookFieldKey | '_' {
  const [head, sub, subsub] = path.map(String);
  if (head === 'spec') {
    if (sub === 'shaft') return subsub === 'lengthIn' ? 'shaft_length' : 'shaft_diameter';
    return (sub && SPEC_FIELD_COLUMN[sub]) || 'category';
  }
  return (head && ITEM_FIELD_COLUMN[head]) || '_';
}

/** "1/3:7.5; 1/2:10:4.1" → horsepower taps with their capacitor µF (and amps when given). */
function parseTaps(text: string): unknown {
  return text
    .split(/\s*;\s*/)
    .filter(Boolean)
    .map((t) => {
      const [horsepower, microfarads, amps] = t.split(/\s*:\s*/);
      return { horsepower, microfarads, amps: amps ?? null };
    });
}

function specFromRow(category: ItemCategory, row: PriceBookRow): unknown {
  const g = (k: PriceBookFieldKey) => (row[k] ?? '').trim();
  const has = (...ks: PriceBookFieldKey[]) => ks.some((k) => g(k) !== '');
  switch (category) {
    case 'motor':
      if (!has('hp', 'volts', 'phase', 'rpm', 'speeds', 'rotation', 'fla', 'capacitor_taps')) return null;
      return {
        category,
        application: g('application') || undefined,
        horsepower: g('hp'),
        volts: g('volts'),
        phase: g('phase'),
        rpm: g('rpm'),
        speeds: g('speeds'),
        rotation: g('rotation'),
        rotationViewedFrom: g('rotation_viewed_from'),
        shaft: has('shaft_diameter', 'shaft_length') ? { diameterIn: g('shaft_diameter'), lengthIn: g('shaft_length') } : null,
        frame: g('frame'),
        fla: g('fla'),
        taps: g('capacitor_taps') ? parseTaps(g('capacitor_taps')) : [],
        capacitorVolts: g('capacitor_volts'),
      };
    case 'capacitor':
      if (!has('microfarads', 'volts', 'shape')) return null;
      return { category, microfarads: g('microfarads'), volts: g('volts'), shape: g('shape'), tolerancePct: g('tolerance') || undefined };
    case 'contactor':
      if (!has('poles', 'coil_volts', 'fla')) return null;
      return { category, poles: g('poles'), coilVolts: g('coil_volts'), fla: g('fla') };
    case 'filter':
      if (!has('filter_size', 'merv')) return null;
      return { category, size: g('filter_size'), merv: g('merv') || null };
    case 'refrigerant':
      if (!has('refrigerant')) return null;
      return {
        category,
        refrigerant: g('refrigerant')
          .toUpperCase()
          .replace(/^R-?(\d)/, 'R-$1'),
      };
    default:
      if (ITEM_CATEGORY_KIND[category] !== 'part' || !has('spec_notes')) return null;
      return { category, notes: g('spec_notes') };
  }
}

const categoryByWord = new Map<string, ItemCategory>(ITEM_CATEGORIES.map((c) => [c, c]));
for (const [w, c] of [
  ['cap', 'capacitor'],
  ['run_capacitor', 'capacitor'],
  ['blower_motor', 'motor'],
  ['fan_motor', 'motor'],
  ['labor', 'repair_labor'],
  ['diagnostic', 'diagnostic_fee'],
  ['tuneup', 'tune_up'],
] as const)
  categoryByWord.set(w, c);

/** Reads one mapped row; problems name the column so the owner can fix the sheet. */
export function itemFromRow(row: PriceBookRow): { value: PriceBookItemInput; problems: [] } | { value: null; problems: RowProblem[] } {
  const problems: RowProblem[] = [];
  const money = (k: 'unit_price' | 'cost', label: string): number | undefined => {
    if (blank(row[k])) {
      if (k === 'cost') return 0;
      problems.push({ field: k, message: `Give the ${label.toLowerCase()}.` });
      return undefined;
    }
    const c = dollarsToCents(row[k]!);
    if (c === null) problems.push({ field: k, message: `${label} is an amount in dollars, like 12.50.` });
    return c ?? undefined;
  };
  const flag = (k: 'taxable' | 'active', label: string, dflt: boolean): boolean | undefined => {
    const w = word(row[k]);
    if (blank(row[k])) return dflt;
    if (YES.has(w)) return true;
    if (NO.has(w)) return false;
    problems.push({ field: k, message: `${label} is yes or no.` });
    return undefined;
  };
  const rawCategory = word(row.category);
  const category = categoryByWord.get(rawCategory);
  const unitCents = money('unit_price', 'Unit price');
  const costCents = money('cost', 'Cost');
  const kind = word(row.kind) || (category ? ITEM_CATEGORY_KIND[category] : '');
  const candidate = {
    sku: row.sku ?? '',
    name: row.name ?? '',
    kind,
    category: category ?? (rawCategory || undefined),
    unit: word(row.unit) || undefined,
    unitCents,
    costCents,
    // Parts are usually taxed and labor is not (common practice in US states that tax parts).
    taxable: flag('taxable', 'Taxable', kind === 'part'),
    partsWarrantyMonths: blank(row.warranty_months) ? undefined : row.warranty_months,
    active: flag('active', 'Active', true),
    spec: category ? specFromRow(category, row) : null,
  };
  if (problems.length) return { value: null, problems };
  const parsed = priceBookItemInputSchema.safeParse(candidate);
  if (parsed.success) return { value: parsed.data, problems: [] };
  const seen = new Set<string>();
  for (const issue of parsed.error.issues) {
    const field = columnOfPath(issue.path);
    const key = `${field}:${issue.message}`;
    if (seen.has(key)) continue;
    seen.add(key);
    problems.push({ field, message: issue.message });
  }
  return { value: null, problems };
}

const hpText = (hp: number) => formatHorsepower(hp).replace(/ hp$/, '');

function specColumns(spec: PartSpec | null): PriceBookRow {
  if (!spec) return {};
  switch (spec.category) {
    case 'motor':
      return {
        application: spec.application,
        hp: Math.abs(spec.horsepower.max - spec.horsepower.min) < HP_EPSILON ? hpText(spec.horsepower.min) : `${hpText(spec.horsepower.min)}-${hpText(spec.horsepower.max)}`,
        volts: spec.volts.map((r) => (r.min === r.max ? `${r.min}` : `${r.min}-${r.max}`)).join('/'),
        phase: String(spec.phase),
        rpm: String(spec.rpm),
        speeds: String(spec.speeds),
        rotation: spec.rotation,
        rotation_viewed_from: spec.rotationViewedFrom ?? '',
        shaft_diameter: spec.shaft ? String(spec.shaft.diameterIn) : '',
        shaft_length: spec.shaft ? String(spec.shaft.lengthIn) : '',
        frame: spec.frame ?? '',
        fla: String(spec.fla),
        capacitor_taps: spec.taps.map((t) => [hpText(t.horsepower), String(t.microfarads), ...(t.amps !== null ? [String(t.amps)] : [])].join(':')).join('; '),
        capacitor_volts: spec.capacitorVolts !== null ? String(spec.capacitorVolts) : '',
      };
    case 'capacitor':
      return { microfarads: spec.microfarads.join('/'), volts: String(spec.volts), shape: spec.shape, tolerance: String(spec.tolerancePct) };
    case 'contactor':
      return { poles: String(spec.poles), coil_volts: String(spec.coilVolts), fla: String(spec.fla) };
    case 'filter':
      return { filter_size: spec.size, merv: spec.merv !== null ? String(spec.merv) : '' };
    case 'refrigerant':
      return { refrigerant: spec.refrigerant };
    default:
      return { spec_notes: spec.notes };
  }
}

/** One item as an export row, with every column present (blank where it does not apply). */
export function rowFromItem(
  item: Pick<PriceBookItem, 'sku' | 'name' | 'kind' | 'category' | 'unit' | 'unitCents' | 'costCents' | 'taxable' | 'partsWarrantyMonths' | 'active' | 'spec'>,
): Record<PriceBookFieldKey, string> {
  const cols: PriceBookRow = {
    sku: item.sku,
    name: item.name,
    kind: item.kind,
    category: item.category,
    unit: item.unit,
    unit_price: centsToDollars(item.unitCents),
    cost: centsToDollars(item.costCents),
    taxable: item.taxable ? 'yes' : 'no',
    warranty_months: String(item.partsWarrantyMonths),
    active: item.active ? 'yes' : 'no',
    ...specColumns(item.spec),
  };
  return Object.fromEntries(PRICE_BOOK_EXPORT_COLUMNS.map((k) => [k, cols[k] ?? ''])) as Record<PriceBookFieldKey, string>;
}
