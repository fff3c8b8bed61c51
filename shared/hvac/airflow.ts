import { requireFinite, requireNonNegative, requirePositive, ReadingInputError } from './errors';
import { airDensityRatio } from './psychrometrics';

/** 60 min/h × 0.075 lb/ft³ × 0.24 Btu/(lb·°F): sensible heat factor for standard air (ASHRAE Fundamentals). */
export const STANDARD_AIR_SENSIBLE_FACTOR = 1.08;
/** One ton of refrigeration. */
export const BTUH_PER_TON = 12_000;
/** Usual design airflow per nominal ton, standard air (common practice). */
export const AIRFLOW_CFM_PER_TON = { min: 350, max: 450 } as const;

/**
 * What an airflow figure means: standard CFM (air at 0.075 lb/ft³, as blower tables and most
 * calculations state it) or actual CFM (the volume moving at the home's own air density, as a
 * flow hood or anemometer reads it).
 */
export const AIRFLOW_BASES = ['standard', 'actual'] as const;
export type AirflowBasis = (typeof AIRFLOW_BASES)[number];

function basisOf(basis: unknown): AirflowBasis {
  if (basis === undefined) return 'standard';
  if (basis === 'standard' || basis === 'actual') return basis;
  throw new ReadingInputError('airflowBasis', `must be "standard" or "actual", got "${String(basis)}"`);
}

/**
 * The sensible heat factor for the airflow as entered. 1.08 holds for standard CFM anywhere; actual
 * CFM at an elevation carries less air, so the factor falls with the air density of the ASHRAE
 * standard atmosphere there.
 */
export function sensibleHeatFactor(i: { altitudeFt?: number; airflowBasis?: AirflowBasis } = {}): number {
  if (basisOf(i.airflowBasis) === 'standard' || i.altitudeFt === undefined) return STANDARD_AIR_SENSIBLE_FACTOR;
  return STANDARD_AIR_SENSIBLE_FACTOR * airDensityRatio(i.altitudeFt);
}

/** Airflow restated as standard CFM (actual CFM × density ratio at the elevation). */
export function standardCfm(i: { airflowCfm: number; altitudeFt?: number; airflowBasis?: AirflowBasis }): number {
  const cfm = requireNonNegative('airflowCfm', i.airflowCfm);
  if (basisOf(i.airflowBasis) === 'standard' || i.altitudeFt === undefined) return cfm;
  return cfm * airDensityRatio(i.altitudeFt);
}

/** Sensible heat moved by an air stream: factor × CFM × ΔT (1.08 for standard air). */
export function sensibleCapacityBtuh(i: { airflowCfm: number; temperatureSplitF: number; altitudeFt?: number; airflowBasis?: AirflowBasis }): number {
  const cfm = requireNonNegative('airflowCfm', i.airflowCfm);
  const dt = requireFinite('temperatureSplitF', i.temperatureSplitF);
  return sensibleHeatFactor(i) * cfm * dt;
}

export function nominalCapacityBtuh(nominalTons: number): number {
  return requirePositive('nominalTons', nominalTons) * BTUH_PER_TON;
}

export function airflowPerTonCfm(i: { airflowCfm: number; nominalTons: number }): number {
  return requireNonNegative('airflowCfm', i.airflowCfm) / requirePositive('nominalTons', i.nominalTons);
}
