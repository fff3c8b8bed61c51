import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { ReadingInputError, targetSuperheatF } from '../../shared/hvac';

describe('fixed-orifice target superheat', () => {
  it('gives 8 °F at 64 °F indoor wet bulb and 96 °F outdoor dry bulb', () => {
    // ((3 × 64) − 80 − 96) / 2 = 8 °F: worked example of the superheat charging method (common practice; service literature).
    expect(targetSuperheatF({ indoorWetBulbF: 64, outdoorDryBulbF: 96 })).toBe(8);
  });

  it('follows ((3 × WB) − 80 − DB) / 2 wherever the target is 5 °F or more', () => {
    fc.assert(
      fc.property(fc.double({ min: 50, max: 76, noNaN: true }), fc.double({ min: 55, max: 115, noNaN: true }), (wb, db) => {
        const formula = (3 * wb - 80 - db) / 2; // superheat charging method (common practice; service literature)
        const t = targetSuperheatF({ indoorWetBulbF: wb, outdoorDryBulbF: db });
        if (formula < 5) expect(t).toBeNull();
        else expect(t).toBeCloseTo(formula, 10);
      }),
    );
  });

  it('says not to charge by superheat when the target falls below 5 °F', () => {
    // Hot outdoors, dry indoors: the method gives no usable superheat (common practice).
    expect(targetSuperheatF({ indoorWetBulbF: 60, outdoorDryBulbF: 100 })).toBeNull();
    expect(targetSuperheatF({ indoorWetBulbF: 63, outdoorDryBulbF: 99 })).toBe(5);
  });

  it('names a missing or non-finite input', () => {
    const f = (wb: number, db: number) => {
      try {
        targetSuperheatF({ indoorWetBulbF: wb, outdoorDryBulbF: db });
      } catch (e) {
        return (e as ReadingInputError).field;
      }
      return null;
    };
    expect(f(Number.NaN, 90)).toBe('indoorWetBulbF');
    expect(f(64, Number.POSITIVE_INFINITY)).toBe('outdoorDryBulbF');
  });
});
