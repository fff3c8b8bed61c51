import type { EquipmentKind } from './equipment';

/**
 * Typical (median) service life per kind of equipment, in years, with where each figure comes from.
 * These are planning figures: a well-kept system often outlives them and a neglected one does not.
 */
export interface ServiceLife {
  years: number;
  source: string;
}

// ASHRAE HVAC Applications Handbook, "Owning and Operating Costs" chapter, median service life
// table (figures recalled, not re-checked against the current edition: from memory).
const ASHRAE = 'ASHRAE HVAC Applications Handbook, Owning and Operating Costs, median service life (from memory)';

export const SERVICE_LIFE: Record<EquipmentKind, ServiceLife> = {
  condensing_unit: { years: 15, source: `${ASHRAE}: residential single or split package air conditioner` },
  heat_pump: { years: 15, source: `${ASHRAE}: residential air-to-air heat pump` },
  gas_furnace: { years: 18, source: `${ASHRAE}: furnace, gas or oil` },
  thermostat: { years: 15, source: `${ASHRAE}: electronic controls` },
  geothermal_heat_pump: { years: 24, source: 'US Department of Energy, Energy Saver: geothermal heat pump indoor components up to 24 years, ground loop 50+ (from memory)' },
  air_handler: { years: 18, source: 'Common practice: an indoor air handler or fan coil lasts about as long as the furnace it replaces' },
  ductless: { years: 15, source: 'Common practice: same as a residential split heat pump' },
  condensate_pump: { years: 6, source: 'Common practice: small residential condensate pumps are replaced every 5 to 7 years' },
  humidifier: { years: 10, source: 'Common practice: whole-house humidifier body; pads are yearly' },
  air_cleaner: { years: 10, source: 'Common practice: whole-house electronic or media air cleaner cabinet' },
};

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
