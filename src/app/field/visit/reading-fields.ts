import type { ReadingCheck, VisitReadings } from '../../../../shared/hvac';
import { READING_HELP } from '../../../../shared/hvac/reading-help';

export type ReadingGroup = 'capacity' | 'air' | 'refrigerant' | 'electrical' | 'airflow' | 'heating' | 'combustion';

export interface ReadingField {
  /** Path in VisitReadings, dotted for nested values. */
  path: string;
  label: string;
  unit: string;
  group: ReadingGroup;
  hint?: string;
  /** Shown only for a compressor of this kind. */
  only?: 'variable_speed';
}

export const GROUP_TITLES: Record<ReadingGroup, string> = {
  capacity: 'Compressor capacity',
  air: 'Air temperatures',
  refrigerant: 'Refrigerant circuit',
  electrical: 'Electrical',
  airflow: 'Airflow',
  heating: 'Heating',
  combustion: 'Carbon monoxide',
};

export const GROUPS_BY_MODE: Record<'cooling' | 'heating', ReadingGroup[]> = {
  cooling: ['capacity', 'air', 'refrigerant', 'electrical', 'airflow'],
  heating: ['capacity', 'air', 'heating', 'combustion', 'electrical', 'airflow'],
};

/** Groups shown only for a compressor that runs below full capacity. */
export const PART_CAPACITY_GROUPS: ReadonlySet<ReadingGroup> = new Set(['capacity']);

/** Help beside the fields the engine explains (RLA, airflow basis, static, CO, variable speed). */
export const FIELD_HELP: Readonly<Record<string, string | undefined>> = READING_HELP;

export const READING_FIELDS: ReadingField[] = [
  { path: 'compressorHz', label: 'Compressor frequency', unit: 'Hz', group: 'capacity', only: 'variable_speed' },
  { path: 'maxCompressorHz', label: 'Model maximum frequency', unit: 'Hz', group: 'capacity', only: 'variable_speed', hint: 'From the equipment record or nameplate' },
  { path: 'capacityPct', label: 'Percent of capacity', unit: '%', group: 'capacity', hint: 'Where the unit shows it; else worked out from the frequency' },

  { path: 'returnDryBulbF', label: 'Return air dry bulb', unit: '°F', group: 'air' },
  { path: 'supplyDryBulbF', label: 'Supply air dry bulb', unit: '°F', group: 'air' },
  { path: 'returnRelativeHumidityPct', label: 'Return air humidity', unit: '% RH', group: 'air' },
  { path: 'indoorWetBulbF', label: 'Return air wet bulb', unit: '°F', group: 'air', hint: 'Leave empty to compute it from dry bulb and humidity' },
  { path: 'outdoorDryBulbF', label: 'Outdoor air dry bulb', unit: '°F', group: 'air' },

  { path: 'suctionPressurePsig', label: 'Suction pressure', unit: 'psig', group: 'refrigerant' },
  { path: 'suctionLineTempF', label: 'Suction line temperature', unit: '°F', group: 'refrigerant' },
  { path: 'liquidPressurePsig', label: 'Liquid line pressure', unit: 'psig', group: 'refrigerant' },
  { path: 'liquidLineTempF', label: 'Liquid line temperature', unit: '°F', group: 'refrigerant' },
  { path: 'subcoolingTargetF', label: 'Nameplate subcooling target', unit: '°F', group: 'refrigerant' },
  { path: 'manufacturerSuperheatRangeF.min', label: 'Manufacturer superheat, low', unit: '°F', group: 'refrigerant', hint: 'TXV or EEV systems' },
  { path: 'manufacturerSuperheatRangeF.max', label: 'Manufacturer superheat, high', unit: '°F', group: 'refrigerant' },

  { path: 'capacitors.compressor.ratedUf', label: 'Compressor capacitor rating', unit: 'µF', group: 'electrical' },
  { path: 'capacitors.compressor.measuredUf', label: 'Compressor capacitor measured', unit: 'µF', group: 'electrical' },
  { path: 'capacitors.compressor.tolerancePct', label: 'Compressor capacitor tolerance', unit: '± %', group: 'electrical', hint: 'As printed; ±6 % when empty' },
  { path: 'capacitors.outdoorFan.ratedUf', label: 'Outdoor fan capacitor rating', unit: 'µF', group: 'electrical' },
  { path: 'capacitors.outdoorFan.measuredUf', label: 'Outdoor fan capacitor measured', unit: 'µF', group: 'electrical' },
  { path: 'capacitors.blower.ratedUf', label: 'Blower capacitor rating', unit: 'µF', group: 'electrical' },
  { path: 'capacitors.blower.measuredUf', label: 'Blower capacitor measured', unit: 'µF', group: 'electrical' },
  { path: 'compressorAmps', label: 'Compressor running amps', unit: 'A', group: 'electrical' },
  { path: 'compressorRatedLoadAmps', label: 'Compressor RLA (nameplate)', unit: 'A', group: 'electrical' },
  { path: 'outdoorFanAmps', label: 'Outdoor fan amps', unit: 'A', group: 'electrical' },
  { path: 'outdoorFanFullLoadAmps', label: 'Outdoor fan FLA (nameplate)', unit: 'A', group: 'electrical' },
  { path: 'blowerAmps', label: 'Blower amps', unit: 'A', group: 'electrical' },
  { path: 'blowerFullLoadAmps', label: 'Blower FLA (nameplate)', unit: 'A', group: 'electrical' },
  { path: 'controlVoltageVac', label: 'Control voltage R–C', unit: 'VAC', group: 'electrical' },

  { path: 'airflowCfm', label: 'Measured airflow', unit: 'CFM', group: 'airflow' },
  { path: 'nominalTons', label: 'Nominal capacity', unit: 'tons', group: 'airflow' },
  { path: 'totalExternalStaticInWc', label: 'Total external static pressure', unit: 'in. w.c.', group: 'airflow' },
  { path: 'maxExternalStaticInWc', label: 'Maximum external static (nameplate)', unit: 'in. w.c.', group: 'airflow', hint: '0.5 in. w.c. when empty' },

  { path: 'flueCoAirFreePpm', label: 'Flue CO air-free', unit: 'ppm', group: 'combustion' },
  { path: 'ambientCoPpm', label: 'Living-space CO', unit: 'ppm', group: 'combustion' },

  { path: 'temperatureRiseF', label: 'Temperature rise', unit: '°F', group: 'heating', hint: 'Leave empty to use supply minus return' },
  { path: 'riseRangeF.min', label: 'Nameplate rise, low', unit: '°F', group: 'heating' },
  { path: 'riseRangeF.max', label: 'Nameplate rise, high', unit: '°F', group: 'heating' },
];

export const CHECK_GROUP: Record<string, ReadingGroup> = {
  temperature_split: 'air',
  temperature_rise: 'heating',
  superheat: 'refrigerant',
  subcooling: 'refrigerant',
  capacitor_compressor: 'electrical',
  capacitor_outdoor_fan: 'electrical',
  capacitor_blower: 'electrical',
  amps_compressor: 'electrical',
  amps_outdoor_fan: 'electrical',
  amps_blower: 'electrical',
  control_voltage: 'electrical',
  sensible_capacity: 'airflow',
  airflow_per_ton: 'airflow',
  external_static_pressure: 'airflow',
  co_flue_air_free: 'combustion',
  co_ambient: 'combustion',
};

export const CAUTION_FOR_GROUP: Partial<Record<ReadingGroup, string>> = {
  refrigerant: 'refrigerant_certification',
  electrical: 'electrical_power_and_capacitors',
  heating: 'fuel_burning_equipment',
  combustion: 'fuel_burning_equipment',
};

// A rule that needs two fields reports the one missing; the other is what to set aside.
const PARTNERS: Record<string, string[]> = {
  suctionLineTempF: ['suctionPressurePsig'],
  suctionPressurePsig: ['suctionLineTempF'],
  liquidLineTempF: ['liquidPressurePsig'],
  liquidPressurePsig: ['liquidLineTempF'],
  refrigerant: ['suctionPressurePsig', 'liquidPressurePsig'],
};

export function setPath(target: Record<string, unknown>, path: string, value: unknown): void {
  const parts = path.split('.');
  let node = target;
  for (const p of parts.slice(0, -1)) {
    node[p] = (node[p] as Record<string, unknown> | undefined) ?? {};
    node = node[p] as Record<string, unknown>;
  }
  node[parts[parts.length - 1]!] = value;
}

export function getPath(source: unknown, path: string): unknown {
  return path.split('.').reduce<unknown>((node, p) => (node && typeof node === 'object' ? (node as Record<string, unknown>)[p] : undefined), source);
}

export function deletePath(target: Record<string, unknown>, path: string): boolean {
  const parts = path.split('.');
  const parent = getPath(target, parts.slice(0, -1).join('.')) ?? (parts.length === 1 ? target : undefined);
  const holder = (parts.length === 1 ? target : parent) as Record<string, unknown> | undefined;
  const last = parts[parts.length - 1]!;
  if (!holder || !(last in holder)) return false;
  delete holder[last];
  return true;
}

/** Typed text to a number: accepts a decimal comma; empty is "not measured". */
export function toNumber(text: string): number | null | 'bad' {
  const t = text.trim().replace(',', '.');
  if (t === '') return null;
  const n = Number(t);
  return Number.isFinite(n) ? n : 'bad';
}

export interface Evaluation {
  checks: ReadingCheck[];
  /** Field path → message, from typing (not a number) or the engine (impossible value). */
  errors: Record<string, string>;
}

/**
 * Runs the engine on what is typed so far. A bad field is reported and set aside, and the rest
 * is evaluated again, so one typo does not hide every other result.
 */
export function evaluateTyped(
  readings: VisitReadings,
  evaluate: (r: VisitReadings) => ReadingCheck[],
  isInputError: (e: unknown) => e is { field: string; message: string },
): Evaluation {
  const errors: Record<string, string> = {};
  const r = structuredClone(readings) as Record<string, unknown>;
  for (let i = 0; i < 12; i++) {
    try {
      return { checks: evaluate(r as VisitReadings), errors };
    } catch (err) {
      if (!isInputError(err)) throw err;
      errors[err.field] ??= err.message.replace(/^[^:]+: /, '');
      if (deletePath(r, err.field)) continue;
      const partners = PARTNERS[err.field] ?? [];
      if (!partners.some((p) => deletePath(r, p))) break;
    }
  }
  return { checks: [], errors };
}
