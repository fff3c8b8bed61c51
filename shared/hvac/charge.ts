import { requireFinite } from './errors';

/**
 * Below this target the fixed-orifice method gives no usable superheat: the
 * evaporator is close to flooding, so charge is checked another way (common practice).
 */
export const FIXED_ORIFICE_MIN_TARGET_SUPERHEAT_F = 5;
/** Acceptable distance from the fixed-orifice target (common practice). */
export const FIXED_ORIFICE_TOLERANCE_F = 5;
/** Superheat band for a TXV or EEV when no manufacturer range is entered (common practice). */
export const EXPANSION_VALVE_DEFAULT_SUPERHEAT_F = { min: 8, max: 12 } as const;
/** Acceptable distance from the nameplate subcooling target (common practice). */
export const SUBCOOLING_TOLERANCE_F = 3;

/**
 * Fixed-orifice (piston, capillary) target superheat: ((3 × indoor WB) − 80 − outdoor DB) / 2,
 * the closed form of the usual superheat charging chart. Returns null where the
 * method says not to charge by superheat (target below about 5 °F).
 */
export function targetSuperheatF(i: { indoorWetBulbF: number; outdoorDryBulbF: number }): number | null {
  const wb = requireFinite('indoorWetBulbF', i.indoorWetBulbF);
  const db = requireFinite('outdoorDryBulbF', i.outdoorDryBulbF);
  const target = (3 * wb - 80 - db) / 2;
  return target < FIXED_ORIFICE_MIN_TARGET_SUPERHEAT_F ? null : target;
}
