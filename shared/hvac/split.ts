import { TARGET_SPLIT_TABLE } from './data/target-split-table';
import { ReadingInputError, requireFinite } from './errors';
import { wetBulbF } from './psychrometrics';

/**
 * Pass band around the target split: ±3 °F, the temperature split method of Title 24 Reference
 * Appendix RA3.2 (from memory: edition not confirmed). More than 3 °F above the target points to
 * low airflow; more than 3 °F below it to low capacity, such as a charge problem.
 */
export const SPLIT_TOLERANCE_F = 3;

/** Where the target split table has rows and columns. */
export const TARGET_SPLIT_RANGE = {
  returnDryBulbF: { min: TARGET_SPLIT_TABLE.dryBulbF[0]!, max: TARGET_SPLIT_TABLE.dryBulbF.at(-1)! },
  returnWetBulbF: { min: TARGET_SPLIT_TABLE.wetBulbF[0]!, max: TARGET_SPLIT_TABLE.wetBulbF.at(-1)! },
} as const;

function bracket(xs: readonly number[], x: number): [number, number, number] {
  let lo = 0;
  while (lo < xs.length - 2 && xs[lo + 1]! <= x) lo++;
  const x0 = xs[lo]!;
  const x1 = xs[lo + 1]!;
  return [lo, lo + 1, (x - x0) / (x1 - x0)];
}

/**
 * The target split for the return air, interpolated in the table of data/target-split.csv
 * (Title 24 RA3.2's target temperature split, from memory; see data/README.md). Null where the air
 * is outside the table or too close to saturation for it.
 */
export function targetSplitF(i: { returnDryBulbF: number; returnWetBulbF: number }): number | null {
  const db = requireFinite('returnDryBulbF', i.returnDryBulbF);
  const wb = requireFinite('returnWetBulbF', i.returnWetBulbF);
  if (wb > db) throw new ReadingInputError('returnWetBulbF', `${wb} °F cannot exceed the dry bulb ${db} °F`);
  const r = TARGET_SPLIT_RANGE;
  if (db < r.returnDryBulbF.min || db > r.returnDryBulbF.max || wb < r.returnWetBulbF.min || wb > r.returnWetBulbF.max) return null;
  const t = TARGET_SPLIT_TABLE;
  const [d0, d1, fd] = bracket(t.dryBulbF, db);
  const [w0, w1, fw] = bracket(t.wetBulbF, wb);
  const c = [t.splitF[d0]![w0], t.splitF[d0]![w1], t.splitF[d1]![w0], t.splitF[d1]![w1]];
  // A corner with no cell would only be needed where the wet bulb is within 1 °F of the dry bulb.
  const needed = [(1 - fd) * (1 - fw), (1 - fd) * fw, fd * (1 - fw), fd * fw];
  if (c.some((v, k) => (v === null || v === undefined) && needed[k]! > 0)) return null;
  return c.reduce<number>((sum, v, k) => sum + (needed[k]! > 0 ? v! * needed[k]! : 0), 0);
}

/** The return wet bulb as read, or worked out from dry bulb and RH with psychrolib (ASHRAE Fundamentals ch. 1). */
export function returnWetBulbF(i: {
  returnDryBulbF?: number;
  returnWetBulbF?: number;
  returnRelativeHumidityPct?: number;
  altitudeFt?: number;
}): { wetBulbF: number; computed: boolean } | null {
  if (i.returnWetBulbF !== undefined) return { wetBulbF: requireFinite('returnWetBulbF', i.returnWetBulbF), computed: false };
  if (i.returnDryBulbF !== undefined && i.returnRelativeHumidityPct !== undefined) {
    return { wetBulbF: wetBulbF({ dryBulbF: i.returnDryBulbF, relativeHumidityPct: i.returnRelativeHumidityPct, altitudeFt: i.altitudeFt }), computed: true };
  }
  return null;
}

/**
 * Target split from return dry bulb and wet bulb (or RH, turned into wet bulb first), so the same
 * air gets the same target however it is entered. Null without a humidity reading, or outside the table.
 */
export function coolingSplitTargetF(i: { returnDryBulbF: number; returnWetBulbF?: number; returnRelativeHumidityPct?: number; altitudeFt?: number }): number | null {
  const wb = returnWetBulbF(i);
  return wb ? targetSplitF({ returnDryBulbF: i.returnDryBulbF, returnWetBulbF: wb.wetBulbF }) : null;
}
