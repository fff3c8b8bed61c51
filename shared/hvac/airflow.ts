import { requireFinite, requireNonNegative, requirePositive } from './errors';

/** 60 min/h × 0.075 lb/ft³ × 0.24 Btu/(lb·°F): sensible heat factor for standard air. */
export const STANDARD_AIR_SENSIBLE_FACTOR = 1.08;
/** One ton of refrigeration. */
export const BTUH_PER_TON = 12_000;
/** Usual design airflow per nominal ton (common practice). */
export const AIRFLOW_CFM_PER_TON = { min: 350, max: 450 } as const;

/** Sensible heat moved by an air stream: 1.08 × CFM × ΔT, standard air. */
export function sensibleCapacityBtuh(i: { airflowCfm: number; temperatureSplitF: number }): number {
  const cfm = requireNonNegative('airflowCfm', i.airflowCfm);
  const dt = requireFinite('temperatureSplitF', i.temperatureSplitF);
  return STANDARD_AIR_SENSIBLE_FACTOR * cfm * dt;
}

export function nominalCapacityBtuh(nominalTons: number): number {
  return requirePositive('nominalTons', nominalTons) * BTUH_PER_TON;
}

export function airflowPerTonCfm(i: { airflowCfm: number; nominalTons: number }): number {
  return requireNonNegative('airflowCfm', i.airflowCfm) / requirePositive('nominalTons', i.nominalTons);
}
