import psychrolib from 'psychrolib';
import { describe, expect, it } from 'vitest';
import { coolingSplitTargetF, evaluateReadings, targetSplitF, type ReadingCheck, type VisitReadings } from '../../shared/hvac';
import { TARGET_SPLIT_TABLE } from '../../shared/hvac/data/target-split-table';

// Reference: psychrolib on its own IP instance (ASHRAE Handbook Fundamentals ch. 1 equations).
const ref = new psychrolib.constructor();
ref.SetUnitSystem(ref.IP);

const split = (r: VisitReadings): ReadingCheck => evaluateReadings(r).find((c) => c.check === 'temperature_split')!;

describe('target split table', () => {
  it('reads its cells at the grid points', () => {
    // Title 24 RA3.2 target temperature split, 70 °F DB row: 20.9 °F at 50 °F WB, 17.7 at 60 (from memory, data/README.md).
    expect(targetSplitF({ returnDryBulbF: 70, returnWetBulbF: 50 })).toBeCloseTo(20.9, 6);
    expect(targetSplitF({ returnDryBulbF: 70, returnWetBulbF: 60 })).toBeCloseTo(17.7, 6);
    expect(targetSplitF({ returnDryBulbF: 80, returnWetBulbF: 67 })).toBeCloseTo(18.1, 6);
  });

  it('interpolates between cells and gives no target outside the table', () => {
    const mid = targetSplitF({ returnDryBulbF: 75.5, returnWetBulbF: 61.5 })!;
    const corners = [
      [75, 61],
      [75, 62],
      [76, 61],
      [76, 62],
    ].map(([db, wb]) => targetSplitF({ returnDryBulbF: db!, returnWetBulbF: wb! })!);
    expect(mid).toBeCloseTo(corners.reduce((a, x) => a + x, 0) / 4, 6); // bilinear at the centre is the mean of the corners
    expect(targetSplitF({ returnDryBulbF: 69, returnWetBulbF: 60 })).toBeNull();
    expect(targetSplitF({ returnDryBulbF: 85, returnWetBulbF: 60 })).toBeNull();
    expect(targetSplitF({ returnDryBulbF: 75, returnWetBulbF: 49 })).toBeNull();
  });

  it('has no cell where the wet bulb would exceed the dry bulb', () => {
    TARGET_SPLIT_TABLE.dryBulbF.forEach((db, i) => TARGET_SPLIT_TABLE.wetBulbF.forEach((wb, j) => expect(TARGET_SPLIT_TABLE.splitF[i]![j] === null).toBe(wb > db)));
  });

  it('says the method does not apply outside the table', () => {
    const c = split({ returnDryBulbF: 90, supplyDryBulbF: 70, indoorWetBulbF: 65 });
    expect(c).toMatchObject({ status: 'watch', expected: {} });
    expect(c.message).toMatch(/does not apply/);
  });
});

describe('the same air, entered two ways', () => {
  it.each([
    [80, 67, 0],
    [75, 61, 0],
    [78, 64, 5000],
  ])('%d °F DB with %d °F WB at %d ft gets the same verdict as its RH', (db, wb, altitudeFt) => {
    // RH of the same air from psychrolib (ASHRAE Fundamentals ch. 1) at the standard-atmosphere pressure of the elevation.
    const rh = ref.GetRelHumFromTWetBulb(db, wb, ref.GetStandardAtmPressure(altitudeFt)) * 100;
    for (const supply of [db - 10, db - 16, db - 20, db - 24, db - 30]) {
      const byWb = split({ returnDryBulbF: db, supplyDryBulbF: supply, indoorWetBulbF: wb, altitudeFt });
      const byRh = split({ returnDryBulbF: db, supplyDryBulbF: supply, returnRelativeHumidityPct: rh, altitudeFt });
      expect(byRh.status).toBe(byWb.status);
      expect(byRh.expected).toEqual(byWb.expected);
    }
    expect(coolingSplitTargetF({ returnDryBulbF: db, returnRelativeHumidityPct: rh, altitudeFt })).toBeCloseTo(coolingSplitTargetF({ returnDryBulbF: db, returnWetBulbF: wb })!, 2);
  });

  it('80 °F DB and 51 % RH is the 80/67 air and gets its target', () => {
    // 80 °F DB / 67 °F WB is about 51 % RH at sea level (ASHRAE psychrometric chart); target 18.1 °F ±3 (table, from memory).
    const c = split({ returnDryBulbF: 80, supplyDryBulbF: 62, returnRelativeHumidityPct: 51.1 });
    expect(c.expected.target).toBeCloseTo(18.1, 0);
    expect(c.status).toBe('ok');
  });
});
