import type { EquipmentKind } from './equipment';

/**
 * Typical (median) service life per kind of equipment, in years, with where each figure comes from.
 * These are planning figures: a well-kept system often outlives them and a neglected one does not.
 */
export interface ServiceLife {
  years: number;
  source: string;
  /** A second published figure to compare with, where one exists. */
  secondReference?: string;
}

// ASHRAE Handbook, HVAC Applications volume, chapter "Owning and Operating Costs", table "Comparison
// of Service Life Estimates": median years in service of each kind of equipment.
const ASHRAE = 'ASHRAE Handbook—HVAC Applications, Owning and Operating Costs, Comparison of Service Life Estimates (median years)';
// National Association of Home Builders with Bank of America Home Equity, "Study of Life Expectancy
// of Home Components" (2007): ranges for house components, the second reference.
const NAHB = 'NAHB Study of Life Expectancy of Home Components (2007)';

export const SERVICE_LIFE: Record<EquipmentKind, ServiceLife> = {
  condensing_unit: {
    years: 15,
    source: `${ASHRAE}: air conditioners, residential single or split package, 15`,
    secondReference: `${NAHB}: air conditioners 10–15 years (from memory)`,
  },
  heat_pump: { years: 15, source: `${ASHRAE}: heat pumps, residential air-to-air, 15`, secondReference: `${NAHB}: heat pumps 16 years (from memory)` },
  gas_furnace: { years: 18, source: `${ASHRAE}: furnaces, gas or oil, 18`, secondReference: `${NAHB}: furnaces 15–20 years (from memory)` },
  thermostat: { years: 15, source: `${ASHRAE}: controls, electronic, 15` },
  // The median for a water-to-air heat pump, not the "up to 24 years" often quoted for indoor parts.
  geothermal_heat_pump: { years: 19, source: `${ASHRAE}: heat pumps, commercial water-to-air, 19 (the ground loop itself lasts far longer)` },
  air_handler: { years: 20, source: `${ASHRAE}: air terminals, induction and fan-coil units, 20` },
  ductless: { years: 15, source: `${ASHRAE}: heat pumps, residential air-to-air, 15 (a ductless split is one)` },
  condensate_pump: {
    years: 6,
    source: "Common practice: small residential condensate pumps are replaced every 5 to 7 years (ASHRAE's 15-year condensate pump is a steam condensate return pump)",
  },
  humidifier: { years: 8, source: `${NAHB}: humidifiers 8 years (from memory); common practice: pads are yearly` },
  air_cleaner: { years: 10, source: 'Common practice: whole-house electronic or media air cleaner cabinet' },
};

/**
 * Filter types with their own change interval. A filter's depth, read from its size, and the
 * type on file decide which one it is.
 */
export const FILTER_CATEGORIES = ['one_inch_fiberglass', 'one_inch_pleated', 'two_inch', 'media_4_5_inch'] as const;
export type FilterCategory = (typeof FILTER_CATEGORIES)[number];

export const FILTER_CATEGORY_LABELS: Record<FilterCategory, string> = {
  one_inch_fiberglass: '1-inch fiberglass',
  one_inch_pleated: '1-inch pleated',
  two_inch: '2-inch',
  media_4_5_inch: '4–5-inch media',
};

/** Days between filter changes, by filter type. A dusty home or pets call for sooner. */
export const FILTER_INTERVAL_DAYS: Record<FilterCategory, number> = {
  // Common practice (filter makers' packaging): flat fiberglass panels load up in about a month.
  one_inch_fiberglass: 30,
  // ENERGY STAR heating and cooling maintenance checklist: check monthly, change at least every 3 months.
  one_inch_pleated: 90,
  // Common practice: a 2-inch pleated filter holds more dust but is still changed about every 3 months.
  two_inch: 90,
  // Common practice (media cabinet makers' instructions): every 6 to 12 months; we remind at 6.
  media_4_5_inch: 180,
};

/**
 * Width, height and depth in inches from a size like "16x25x4", "16 x 25 x 4 in" or "20X25X4.5 inches";
 * null when it does not read as a size.
 */
export function filterDimensionsIn(size: string): { width: number; height: number; depth: number } | null {
  if (typeof size !== 'string') return null;
  const m = /^\s*(\d{1,2}(?:\.\d{1,3})?)\s*[x×]\s*(\d{1,2}(?:\.\d{1,3})?)\s*[x×]\s*(\d{1,2}(?:\.\d{1,3})?)\s*(?:"|in(?:ch(?:es)?)?\.?)?\s*$/i.exec(size);
  if (!m) return null;
  return { width: Number(m[1]), height: Number(m[2]), depth: Number(m[3]) };
}

/**
 * The filter type for the change interval. Nominal depths: 1 inch (actual about 3/4), 2 inches,
 * and 4 or 5 inches for media cabinets (actual about 3 5/8 to 4 7/8). A 1-inch filter is pleated
 * unless its type on file says fiberglass, the usual 1-inch filter sold today (common practice).
 */
export function filterCategory(size: string, type = ''): FilterCategory {
  const depth = filterDimensionsIn(size)?.depth;
  const t = typeof type === 'string' ? type.toLowerCase() : '';
  if ((depth !== undefined && depth >= 3) || /\bmedia\b/.test(t)) return 'media_4_5_inch';
  if (depth !== undefined && depth >= 1.5) return 'two_inch';
  if (/fib(er|re) ?glass|spun ?glass/.test(t)) return 'one_inch_fiberglass';
  return 'one_inch_pleated';
}

export function filterIntervalDays(category: FilterCategory): number {
  const days = FILTER_INTERVAL_DAYS[category];
  if (days === undefined) throw new RangeError(`filter: unknown filter type "${String(category)}"`);
  return days;
}

/** Share of the typical life after which we flag a system as nearing the end of its service life. */
export const NEARING_SHARE = 0.8;

export type LifeStatus = 'unknown' | 'ok' | 'nearing' | 'past';
export const LIFE_STATUS_LABELS: Record<LifeStatus, string> = {
  unknown: 'Install date unknown',
  ok: 'Within typical service life',
  nearing: 'Nearing end of service life',
  past: 'Past typical service life',
};

export interface Age {
  years: number;
  months: number;
  /** Fractional years, for comparisons. */
  exact: number;
}

const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})$/;

function parts(field: string, iso: string): [number, number, number] {
  const m = ISO_DATE.exec(iso);
  if (!m) throw new RangeError(`${field}: use a date like 2019-06-30`);
  const [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])];
  const check = new Date(Date.UTC(y, mo - 1, d));
  if (check.getUTCFullYear() !== y || check.getUTCMonth() !== mo - 1 || check.getUTCDate() !== d) throw new RangeError(`${field}: ${iso} is not a calendar date`);
  return [y, mo, d];
}

/** True when an ISO date string names a real calendar day. */
export function isCalendarDate(iso: string): boolean {
  try {
    parts('date', iso);
    return true;
  } catch {
    return false;
  }
}

/**
 * Age from the install date to today (both ISO dates, today in the company's time zone), in whole
 * years and months the way people count birthdays: a unit installed on 29 Feb turns one on 28 Feb.
 */
export function equipmentAge(installedOn: string, today: string): Age {
  const [y1, m1, d1] = parts('installedOn', installedOn);
  const [y2, m2, d2] = parts('today', today);
  let months = (y2 - y1) * 12 + (m2 - m1);
  const lastDayOfThisMonth = new Date(Date.UTC(y2, m2, 0)).getUTCDate();
  if (d2 < Math.min(d1, lastDayOfThisMonth)) months -= 1;
  if (months < 0) throw new RangeError(`installedOn: ${installedOn} is after today (${today})`);
  return { years: Math.floor(months / 12), months: months % 12, exact: months / 12 };
}

export function ageText(age: Age): string {
  if (age.years === 0 && age.months === 0) return 'Less than a month';
  const y = age.years ? `${age.years} year${age.years === 1 ? '' : 's'}` : '';
  const m = age.months ? `${age.months} month${age.months === 1 ? '' : 's'}` : '';
  return [y, m].filter(Boolean).join(', ');
}

export interface LifeAssessment {
  status: LifeStatus;
  label: string;
  typicalYears: number;
  source: string;
  age: Age | null;
  /** Whole years left of the typical life; negative once past it; null without an install date. */
  yearsLeft: number | null;
}

/** Where a piece of equipment stands against the typical service life of its kind. */
export function assessServiceLife(kind: EquipmentKind, installedOn: string | null, today: string): LifeAssessment {
  const life = SERVICE_LIFE[kind];
  if (!life) throw new RangeError(`kind: unknown equipment kind "${String(kind)}"`);
  if (!installedOn) return { status: 'unknown', label: LIFE_STATUS_LABELS.unknown, typicalYears: life.years, source: life.source, age: null, yearsLeft: null };
  const age = equipmentAge(installedOn, today);
  const status: LifeStatus = age.exact >= life.years ? 'past' : age.exact >= life.years * NEARING_SHARE ? 'nearing' : 'ok';
  return { status, label: LIFE_STATUS_LABELS[status], typicalYears: life.years, source: life.source, age, yearsLeft: Math.floor(life.years - age.exact) };
}

export type WarrantyStatus = 'unknown' | 'active' | 'ending_soon' | 'expired';
export const WARRANTY_STATUS_LABELS: Record<WarrantyStatus, string> = {
  unknown: 'Warranty not recorded',
  active: 'Under warranty',
  ending_soon: 'Warranty ends within 90 days',
  expired: 'Warranty ended',
};

/** Manufacturer warranty against today; "ending soon" inside 90 days so a claim is not missed. */
export function warrantyStatus(endsOn: string | null, today: string): WarrantyStatus {
  if (!endsOn) return 'unknown';
  const [y1, m1, d1] = parts('warrantyEndsOn', endsOn);
  const [y2, m2, d2] = parts('today', today);
  const days = (Date.UTC(y1, m1 - 1, d1) - Date.UTC(y2, m2 - 1, d2)) / 86_400_000;
  if (days < 0) return 'expired';
  return days <= 90 ? 'ending_soon' : 'active';
}
