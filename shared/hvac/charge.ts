import { requireFinite } from './errors';

/**
 * Below this target the fixed-orifice method gives no usable superheat: Title 24 Reference
 * Appendix RA3.2 does not verify charge by superheat where the target is under 5 °F.
 */
export const FIXED_ORIFICE_MIN_TARGET_SUPERHEAT_F = 5;
/** Pass band around the fixed-orifice target superheat: ±5 °F (Title 24 Reference Appendix RA3.2). */
export const FIXED_ORIFICE_TOLERANCE_F = 5;
/**
 * The superheat charging chart's range (Title 24 RA3.2's target superheat table, from memory):
 * outdoor dry bulb 55–115 °F and return wet bulb 50–76 °F. Outside it the method does not apply.
 */
export const FIXED_ORIFICE_CHART = { outdoorDryBulbF: { min: 55, max: 115 }, indoorWetBulbF: { min: 50, max: 76 } } as const;
/** Superheat band for a TXV or EEV when no manufacturer range is entered (common practice). */
export const EXPANSION_VALVE_DEFAULT_SUPERHEAT_F = { min: 8, max: 12 } as const;
/**
 * Outside this band a TXV or EEV with no manufacturer range is an alert: the superheat check of
 * Title 24 RA3.2's subcooling method (from memory: edition not confirmed).
 */
export const EXPANSION_VALVE_ALERT_SUPERHEAT_F = { min: 4, max: 25 } as const;
/**
 * Superheat at the service port below this is an alert on every metering device: liquid may be
 * reaching the compressor (common practice; piston charging charts commonly state this floor).
 */
export const MIN_SAFE_SUPERHEAT_F = 5;
/** Acceptable distance from the nameplate subcooling target (common practice). */
export const SUBCOOLING_TOLERANCE_F = 3;

export type FixedOrificeTarget = { kind: 'target'; targetF: number } | { kind: 'below_minimum'; formulaF: number } | { kind: 'outside_chart'; reason: string };

/**
 * Fixed-orifice (piston, capillary) target superheat: ((3 × indoor WB) − 80 − outdoor DB) / 2,
 * the closed form of the usual superheat charging chart (common practice; service literature),
 * valid only inside the chart's range.
 */
export function fixedOrificeTarget(i: { indoorWetBulbF: number; outdoorDryBulbF: number }): FixedOrificeTarget {
  const wb = requireFinite('indoorWetBulbF', i.indoorWetBulbF);
  const db = requireFinite('outdoorDryBulbF', i.outdoorDryBulbF);
  const c = FIXED_ORIFICE_CHART;
  if (db < c.outdoorDryBulbF.min) return { kind: 'outside_chart', reason: `outdoor ${db} °F is below the chart's ${c.outdoorDryBulbF.min} °F` };
  if (db > c.outdoorDryBulbF.max) return { kind: 'outside_chart', reason: `outdoor ${db} °F is above the chart's ${c.outdoorDryBulbF.max} °F` };
  if (wb < c.indoorWetBulbF.min || wb > c.indoorWetBulbF.max) {
    return { kind: 'outside_chart', reason: `indoor wet bulb ${Math.round(wb * 10) / 10} °F is outside the chart's ${c.indoorWetBulbF.min}–${c.indoorWetBulbF.max} °F` };
  }
  const target = (3 * wb - 80 - db) / 2;
  return target < FIXED_ORIFICE_MIN_TARGET_SUPERHEAT_F ? { kind: 'below_minimum', formulaF: target } : { kind: 'target', targetF: target };
}

/**
 * The fixed-orifice target superheat, or null where the method gives none: a target under 5 °F,
 * or conditions outside the chart.
 */
export function targetSuperheatF(i: { indoorWetBulbF: number; outdoorDryBulbF: number }): number | null {
  const t = fixedOrificeTarget(i);
  return t.kind === 'target' ? t.targetF : null;
}
