export { ReadingInputError } from './errors';
export {
  REFRIGERANTS,
  A2L_REFRIGERANTS,
  HIGH_GLIDE_REFRIGERANTS,
  PERFECT_VACUUM_PSIG,
  SEA_LEVEL_PSIA,
  saturationPressurePsig,
  saturationTemperatureF,
  superheatF,
  subcoolingF,
  tableGaugePsig,
  type Refrigerant,
  type SaturationPoint,
} from './refrigerants';
export { atmosphericPressurePsia, airDensityRatio, wetBulbF, dewPointF, moistAirFromWetBulb, type MoistAirState } from './psychrometrics';
export {
  targetSuperheatF,
  fixedOrificeTarget,
  FIXED_ORIFICE_MIN_TARGET_SUPERHEAT_F,
  FIXED_ORIFICE_TOLERANCE_F,
  FIXED_ORIFICE_CHART,
  EXPANSION_VALVE_DEFAULT_SUPERHEAT_F,
  EXPANSION_VALVE_ALERT_SUPERHEAT_F,
  MIN_SAFE_SUPERHEAT_F,
  SUBCOOLING_TOLERANCE_F,
  type FixedOrificeTarget,
} from './charge';
export {
  sensibleCapacityBtuh,
  sensibleHeatFactor,
  standardCfm,
  nominalCapacityBtuh,
  airflowPerTonCfm,
  STANDARD_AIR_SENSIBLE_FACTOR,
  BTUH_PER_TON,
  AIRFLOW_CFM_PER_TON,
  AIRFLOW_BASES,
  type AirflowBasis,
} from './airflow';
export { targetSplitF, returnWetBulbF, SPLIT_TOLERANCE_F, TARGET_SPLIT_RANGE } from './split';
export { capacityPctFromFrequency, capacityState, FULL_CAPACITY_TEST_PROMPT, COMPRESSOR_TYPES, type CompressorType, type CapacityState } from './capacity';
export { microfaradsFromCurrent, RUN_CAPACITOR_DEFAULT_TOLERANCE_PCT, CONTROL_VOLTAGE_NOMINAL_VAC } from './electrical';
export { visitReadingsSchema, capacitorReadingSchema, CAPACITOR_POSITIONS, type VisitReadings, type CapacitorReading, type CapacitorPosition } from './readings';
export {
  evaluateReadings,
  coolingSplitTargetF,
  COOLING_SPLIT_F,
  DEFAULT_MAX_EXTERNAL_STATIC_IN_WC,
  FLUE_CO_AIR_FREE_PPM,
  AMBIENT_CO_PPM,
  READING_HELP,
  type ReadingCheck,
  type CheckStatus,
} from './evaluate';
export { homeownerWording } from './wording';
export {
  tuneUpChecklist,
  tuneUpChecklistOn,
  checklistSeasonOf,
  furnaceHasCasedCoil,
  EQUIPMENT_KINDS,
  type EquipmentKind,
  type Season,
  type ChecklistItem,
  type ChecklistOptions,
} from './checklists';
export { cautions, technicianCautionsFor, type Caution } from './cautions';
