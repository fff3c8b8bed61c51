export const EQUIPMENT_KINDS = [
  'condensing_unit',
  'heat_pump',
  'air_handler',
  'gas_furnace',
  'geothermal_heat_pump',
  'ductless',
  'thermostat',
  'condensate_pump',
  'humidifier',
  'air_cleaner',
] as const;
export type EquipmentKind = (typeof EQUIPMENT_KINDS)[number];

export const EQUIPMENT_KIND_LABELS: Record<EquipmentKind, string> = {
  condensing_unit: 'Condensing unit (split AC)',
  heat_pump: 'Heat pump',
  air_handler: 'Air handler / fan coil',
  gas_furnace: 'Gas furnace',
  geothermal_heat_pump: 'Geothermal (water-source) heat pump',
  ductless: 'Ductless unit',
  thermostat: 'Thermostat',
  condensate_pump: 'Condensate pump',
  humidifier: 'Humidifier',
  air_cleaner: 'Air cleaner',
};

export const REFRIGERANTS = ['R-410A', 'R-22', 'R-32', 'R-454B', 'R-407C'] as const;
export type RefrigerantName = (typeof REFRIGERANTS)[number];

export const METERING_DEVICES = ['fixed', 'txv', 'eev'] as const;
export type MeteringDevice = (typeof METERING_DEVICES)[number];

/** How the compressor's capacity is controlled. */
export const COMPRESSOR_TYPES = ['fixed_speed', 'two_stage', 'variable_speed'] as const;
export type CompressorType = (typeof COMPRESSOR_TYPES)[number];
export const COMPRESSOR_TYPE_LABELS: Record<CompressorType, string> = {
  fixed_speed: 'Fixed-speed',
  two_stage: 'Two-stage',
  variable_speed: 'Variable-speed (inverter)',
};
