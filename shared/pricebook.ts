// The price book's vocabulary: what an item is, which categories exist, money limits, and the
// nameplate notations (fractional horsepower, "208-230 V") that specs and searches share.
// No zod here: shared/schemas/pricebook.ts builds the API contract on top of it.

export const ITEM_KINDS = ['part', 'labor', 'fee'] as const;
export type ItemKind = (typeof ITEM_KINDS)[number];
export const ITEM_KIND_LABELS: Record<ItemKind, string> = { part: 'Part', labor: 'Labor', fee: 'Fee' };

/** Parts whose specification is structured, so a failed one can be matched to a replacement. */
export const SPEC_CATEGORIES = ['motor', 'capacitor', 'contactor', 'filter', 'refrigerant'] as const;
export type SpecCategory = (typeof SPEC_CATEGORIES)[number];

/** Parts recorded by name only. */
export const PLAIN_PART_CATEGORIES = [
  'control_board',
  'igniter',
  'flame_sensor',
  'gas_valve',
  'pressure_switch',
  'relay',
  'thermostat',
  'coil',
  'metering_device',
  'compressor',
  'consumable',
  'other_part',
] as const;
export type PlainPartCategory = (typeof PLAIN_PART_CATEGORIES)[number];

export const LABOR_CATEGORIES = ['repair_labor', 'maintenance_labor', 'install_labor'] as const;
export const FEE_CATEGORIES = ['diagnostic_fee', 'tune_up', 'trip_fee', 'after_hours', 'permit', 'disposal', 'other_fee'] as const;

export const ITEM_CATEGORIES = [...SPEC_CATEGORIES, ...PLAIN_PART_CATEGORIES, ...LABOR_CATEGORIES, ...FEE_CATEGORIES] as const;
export type ItemCategory = (typeof ITEM_CATEGORIES)[number];

export const ITEM_CATEGORY_LABELS: Record<ItemCategory, string> = {
  motor: 'Motor',
  capacitor: 'Capacitor',
  contactor: 'Contactor',
  filter: 'Filter',
  refrigerant: 'Refrigerant',
  control_board: 'Control board',
  igniter: 'Igniter',
  flame_sensor: 'Flame sensor',
  gas_valve: 'Gas valve',
  pressure_switch: 'Pressure switch',
  relay: 'Relay',
  thermostat: 'Thermostat',
  coil: 'Coil',
  metering_device: 'Metering device (TXV, piston)',
  compressor: 'Compressor',
  consumable: 'Shop supplies',
  other_part: 'Other part',
  repair_labor: 'Repair labor',
  maintenance_labor: 'Maintenance labor',
  install_labor: 'Install labor',
  diagnostic_fee: 'Diagnostic fee',
  tune_up: 'Tune-up',
  trip_fee: 'Trip fee',
  after_hours: 'After-hours fee',
  permit: 'Permit',
  disposal: 'Disposal fee',
  other_fee: 'Other fee',
};

/** Which kind each category belongs to, so an item's kind and category always agree. */
export const ITEM_CATEGORY_KIND: Record<ItemCategory, ItemKind> = Object.fromEntries([
  ...[...SPEC_CATEGORIES, ...PLAIN_PART_CATEGORIES].map((c) => [c, 'part']),
  ...LABOR_CATEGORIES.map((c) => [c, 'labor']),
  ...FEE_CATEGORIES.map((c) => [c, 'fee']),
]) as Record<ItemCategory, ItemKind>;

export const categoriesOfKind = (kind: ItemKind): ItemCategory[] => ITEM_CATEGORIES.filter((c) => ITEM_CATEGORY_KIND[c] === kind);

/**
 * Parts a manufacturer's parts warranty replaces at no charge. Refrigerant, filters and shop
 * supplies are consumed in the repair and are not covered (common practice in residential
 * equipment warranties).
 */
export const WARRANTY_PART_CATEGORIES: readonly ItemCategory[] = categoriesOfKind('part').filter((c) => !['refrigerant', 'filter', 'consumable'].includes(c));

/** A starting point for the owner's choice of repair-discount categories: repair parts and repair labor. */
export const DEFAULT_DISCOUNT_CATEGORIES: readonly ItemCategory[] = [...WARRANTY_PART_CATEGORIES, 'repair_labor'];

export const ITEM_UNITS = ['each', 'hour', 'lb', 'ft'] as const;
export type ItemUnit = (typeof ITEM_UNITS)[number];

// ---- Money limits: small enough that a quote's sums stay far inside safe integers ----

/** One line (unit price, or quantity × unit price): at most $999,999.99. */
export const LINE_MAX_CENTS = 99_999_999;
/** One option's or one quote's total: at most $9,999,999.99. */
export const QUOTE_MAX_CENTS = 999_999_999;
/** Quantities allow 3 decimals (hours, pounds), as on invoices. */
export const QUANTITY_MAX = 10_000;
export const LINES_PER_OPTION_MAX = 50;
export const OPTIONS_PER_QUOTE_MAX = 4;

// ---- Horsepower as nameplates print it ----

/** Same horsepower when within this much (1/3 hp is stored as 0.3333…). */
export const HP_EPSILON = 0.002;

const HP_FRACTIONS: [number, string][] = [
  [1 / 20, '1/20'],
  [1 / 15, '1/15'],
  [1 / 12, '1/12'],
  [1 / 10, '1/10'],
  [1 / 8, '1/8'],
  [1 / 6, '1/6'],
  [1 / 5, '1/5'],
  [1 / 4, '1/4'],
  [1 / 3, '1/3'],
  [1 / 2, '1/2'],
  [2 / 3, '2/3'],
  [3 / 4, '3/4'],
];

/** "1/3", "1/2 hp", "0.75", "1 1/2" → horsepower as a number; null when it is not one. */
export function parseHorsepower(value: unknown): number | null {
  if (typeof value === 'number') return Number.isFinite(value) ? value : null;
  if (typeof value !== 'string') return null;
  const t = value
    .trim()
    .toLowerCase()
    .replace(/\s*hp$/, '')
    .trim();
  const mixed = /^(\d+)\s+(\d+)\/(\d+)$/.exec(t);
  if (mixed) return Number(mixed[3]) === 0 ? null : Number(mixed[1]) + Number(mixed[2]) / Number(mixed[3]);
  const frac = /^(\d+)\/(\d+)$/.exec(t);
  if (frac) return Number(frac[2]) === 0 ? null : Number(frac[1]) / Number(frac[2]);
  return /^\d*\.?\d+$/.test(t) ? Number(t) : null;
}

/** 0.3333 → "1/3 hp", 1.5 → "1 1/2 hp", 0.6 → "0.6 hp". */
export function formatHorsepower(hp: number): string {
  const whole = Math.floor(hp + HP_EPSILON);
  const rest = hp - whole;
  if (Math.abs(rest) < HP_EPSILON) return `${whole} hp`;
  const f = HP_FRACTIONS.find(([v]) => Math.abs(v - rest) < HP_EPSILON);
  if (f) return `${whole > 0 ? `${whole} ` : ''}${f[1]} hp`;
  return `${Number(hp.toFixed(3))} hp`;
}

export interface HpRange {
  min: number;
  max: number;
}
export const formatHpRange = (r: HpRange) =>
  Math.abs(r.max - r.min) < HP_EPSILON ? formatHorsepower(r.min) : `${formatHorsepower(r.min).replace(/ hp$/, '')}–${formatHorsepower(r.max)}`;

// ---- Voltage ratings ----

export interface VoltRange {
  min: number;
  max: number;
}

/**
 * "230", "208-230", "208/230", "115/208-230" → voltage ranges. Nameplates write a dual-rated
 * motor as "208-230" or "208/230" (one winding good across that span) and a dual-voltage motor
 * as "115/230" (either, by wiring): values within 15 % of each other are read as one span
 * (common practice).
 */
export function parseVoltRanges(value: unknown): VoltRange[] | null {
  if (typeof value === 'number') return Number.isFinite(value) ? [{ min: value, max: value }] : null;
  if (typeof value !== 'string') return null;
  const pieces = value
    .replace(/\s*v(olts?)?\b/gi, '')
    .split(/[/,;]/)
    .map((p) => p.trim())
    .filter(Boolean);
  if (!pieces.length) return null;
  const ranges: VoltRange[] = [];
  for (const p of pieces) {
    const m = /^(\d{2,3})(?:\s*[-–]\s*(\d{2,3}))?$/.exec(p);
    if (!m) return null;
    const a = Number(m[1]);
    const b = m[2] ? Number(m[2]) : a;
    ranges.push({ min: Math.min(a, b), max: Math.max(a, b) });
  }
  ranges.sort((x, y) => x.min - y.min);
  const merged: VoltRange[] = [];
  for (const r of ranges) {
    const last = merged[merged.length - 1];
    if (last && r.min <= last.max * 1.15) last.max = Math.max(last.max, r.max);
    else merged.push({ ...r });
  }
  return merged;
}

export const formatVoltRanges = (rs: readonly VoltRange[]) => `${rs.map((r) => (r.min === r.max ? `${r.min}` : `${r.min}–${r.max}`)).join('/')} V`;

/** ±6 % is the usual tolerance printed on a run capacitor (common practice); some cans say ±5 % or ±10 %. */
export const DEFAULT_CAPACITOR_TOLERANCE_PCT = 6;

/** A multi-speed motor's speed taps, fastest first. */
export const SPEED_TAPS = ['high', 'medium_high', 'medium', 'medium_low', 'low'] as const;
export type SpeedTap = (typeof SPEED_TAPS)[number];

export const MOTOR_APPLICATIONS = ['indoor_blower', 'condenser_fan', 'draft_inducer', 'other'] as const;

export type MotorApplication = (typeof MOTOR_APPLICATIONS)[number];

export const MOTOR_APPLICATION_LABELS: Record<MotorApplication, string> = {
  indoor_blower: 'indoor blower',
  condenser_fan: 'condenser fan',
  draft_inducer: 'draft inducer',
  other: 'other use',
};

export const QUOTE_STATUSES = ['draft', 'sent', 'approved', 'declined', 'expired'] as const;

export type QuoteStatus = (typeof QUOTE_STATUSES)[number];

export const QUOTE_STATUS_LABELS: Record<QuoteStatus, string> = { draft: 'Draft', sent: 'Sent', approved: 'Approved', declined: 'Declined', expired: 'Expired' };

/** Only these may still change; an approved quote is frozen and a change makes a new revision. */
export const EDITABLE_QUOTE_STATUSES: readonly QuoteStatus[] = ['draft', 'sent'];

export const PRICE_BOOK_IMPORT_FIELDS = [
  { key: 'sku', label: 'SKU', part: 'item', required: true, aliases: ['item number', 'part number', 'code'] },
  { key: 'name', label: 'Name', part: 'item', required: true, aliases: ['item', 'description', 'item name'] },
  { key: 'kind', label: 'Kind', part: 'item', required: true, aliases: ['type', 'item type'] },
  { key: 'category', label: 'Category', part: 'item', required: true, aliases: ['group'] },
  { key: 'unit', label: 'Unit', part: 'item', required: false, aliases: ['uom', 'unit of measure'] },
  { key: 'unit_price', label: 'Unit price', part: 'item', required: true, aliases: ['price', 'sell price', 'rate'] },
  { key: 'cost', label: 'Cost', part: 'item', required: false, aliases: ['unit cost', 'our cost'] },
  { key: 'taxable', label: 'Taxable', part: 'item', required: false, aliases: ['tax', 'taxed'] },
  { key: 'warranty_months', label: 'Parts warranty (months)', part: 'item', required: false, aliases: ['warranty', 'parts warranty'] },
  { key: 'active', label: 'Active', part: 'item', required: false, aliases: ['offered', 'enabled'] },
  { key: 'application', label: 'Motor use', part: 'spec', required: false, aliases: ['use', 'motor use'] },
  { key: 'hp', label: 'Horsepower', part: 'spec', required: false, aliases: ['horsepower'] },
  { key: 'volts', label: 'Volts', part: 'spec', required: false, aliases: ['voltage', 'v'] },
  { key: 'phase', label: 'Phase', part: 'spec', required: false, aliases: ['ph'] },
  { key: 'rpm', label: 'RPM', part: 'spec', required: false, aliases: ['speed'] },
  { key: 'speeds', label: 'Speeds', part: 'spec', required: false, aliases: ['number of speeds'] },
  { key: 'rotation', label: 'Rotation', part: 'spec', required: false, aliases: ['rot'] },
  { key: 'rotation_viewed_from', label: 'Rotation seen from', part: 'spec', required: false, aliases: ['rotation view', 'viewed from'] },
  { key: 'shaft_diameter', label: 'Shaft diameter (in)', part: 'spec', required: false, aliases: ['shaft dia', 'shaft diameter'] },
  { key: 'shaft_length', label: 'Shaft length (in)', part: 'spec', required: false, aliases: ['shaft length'] },
  { key: 'frame', label: 'Frame', part: 'spec', required: false, aliases: ['frame size'] },
  { key: 'fla', label: 'Rated amps (FLA)', part: 'spec', required: false, aliases: ['amps', 'rated amps'] },
  { key: 'capacitor_taps', label: 'Capacitor µF by hp', part: 'spec', required: false, aliases: ['uf by hp', 'capacitor by hp', 'taps'] },
  { key: 'capacitor_volts', label: 'Capacitor volts', part: 'spec', required: false, aliases: ['cap volts'] },
  { key: 'microfarads', label: 'µF', part: 'spec', required: false, aliases: ['uf', 'mfd', 'microfarads'] },
  { key: 'shape', label: 'Shape', part: 'spec', required: false, aliases: ['can shape'] },
  { key: 'tolerance', label: 'Tolerance (%)', part: 'spec', required: false, aliases: ['tolerance'] },
  { key: 'poles', label: 'Poles', part: 'spec', required: false, aliases: [] },
  { key: 'coil_volts', label: 'Coil volts', part: 'spec', required: false, aliases: ['coil voltage'] },
  { key: 'filter_size', label: 'Filter size', part: 'spec', required: false, aliases: ['size'] },
  { key: 'merv', label: 'MERV', part: 'spec', required: false, aliases: [] },
  { key: 'refrigerant', label: 'Refrigerant', part: 'spec', required: false, aliases: [] },
  { key: 'spec_notes', label: 'Spec notes', part: 'spec', required: false, aliases: ['notes'] },
] as const;

export type PriceBookFieldKey = (typeof PRICE_BOOK_IMPORT_FIELDS)[number]['key'];

export const PRICE_BOOK_FIELD_KEYS = PRICE_BOOK_IMPORT_FIELDS.map((f) => f.key) as PriceBookFieldKey[];
