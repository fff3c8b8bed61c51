export { ReadingInputError } from './errors';
export {
  REFRIGERANTS,
  PERFECT_VACUUM_PSIG,
  saturationPressurePsig,
  saturationTemperatureF,
  superheatF,
  subcoolingF,
  type Refrigerant,
  type SaturationPoint,
} from './refrigerants';
export { atmosphericPressurePsia, wetBulbF, dewPointF, moistAirFromWetBulb, type MoistAirState } from './psychrometrics';
export {
  targetSuperheatF,
  FIXED_ORIFICE_MIN_TARGET_SUPERHEAT_F,
  FIXED_ORIFICE_TOLERANCE_F,
  EXPANSION_VALVE_DEFAULT_SUPERHEAT_F,
  SUBCOOLING_TOLERANCE_F,
} from './charge';
export {
  sensibleCapacityBtuh,
  nominalCapacityBtuh,
  airflowPerTonCfm,
  STANDARD_AIR_SENSIBLE_FACTOR,
  BTUH_PER_TON,
  AIRFLOW_CFM_PER_TON,
} from './airflow';
export { microfaradsFromCurrent, RUN_CAPACITOR_DEFAULT_TOLERANCE_PCT, CONTROL_VOLTAGE_NOMINAL_VAC } from './electrical';
export {
  visitReadingsSchema,
  capacitorReadingSchema,
  CAPACITOR_POSITIONS,
  type VisitReadings,
  type CapacitorReading,
  type CapacitorPosition,
} from './readings';
export { evaluateReadings, coolingSplitTargetF, COOLING_SPLIT_F, type ReadingCheck, type CheckStatus } from './evaluate';
export { homeownerWording } from './wording';
export { tuneUpChecklist, EQUIPMENT_KINDS, type EquipmentKind, type Season, type ChecklistItem } from './checklists';
export { cautions, type Caution } from './cautions';
