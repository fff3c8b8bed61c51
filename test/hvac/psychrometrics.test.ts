import fc from 'fast-check';
import psychrolib from 'psychrolib';
import { describe, expect, it } from 'vitest';
import { ReadingInputError, atmosphericPressurePsia, dewPointF, moistAirFromWetBulb, wetBulbF } from '../../shared/hvac';

// Reference: psychrolib itself (ASHRAE Handbook Fundamentals ch. 1 equations), on its own IP instance.
const ref = new psychrolib.constructor();
ref.SetUnitSystem(ref.IP);

function fieldOf(fn: () => unknown): string {
  try {
    fn();
  } catch (e) {
    if (e instanceof ReadingInputError) return e.field;
    throw e;
  }
  throw new Error('expected a ReadingInputError');
}

describe('psychrometrics', () => {
  it('matches the ASHRAE worked example at 100 °F dry bulb, 65 °F wet bulb', () => {
    // ASHRAE Handbook Fundamentals ch. 1 worked example, sea level: W ≈ 0.0052 lb/lb, dew point ≈ 40 °F.
    const s = moistAirFromWetBulb({ dryBulbF: 100, wetBulbF: 65 });
    expect(s.humidityRatio).toBeCloseTo(0.0052, 4);
    expect(s.dewPointF).toBeCloseTo(40, 0);
    // Same air described by its RH gives the same dew point and wet bulb.
    expect(dewPointF({ dryBulbF: 100, relativeHumidityPct: s.relativeHumidityPct })).toBeCloseTo(40, 0);
    expect(wetBulbF({ dryBulbF: 100, relativeHumidityPct: s.relativeHumidityPct })).toBeCloseTo(65, 2);
  });

  it('agrees with psychrolib across indoor and outdoor conditions', () => {
    fc.assert(
      fc.property(fc.double({ min: 40, max: 115, noNaN: true }), fc.double({ min: 5, max: 100, noNaN: true }), fc.double({ min: 0, max: 10000, noNaN: true }), (db, rh, alt) => {
        const p = ref.GetStandardAtmPressure(alt);
        expect(wetBulbF({ dryBulbF: db, relativeHumidityPct: rh, altitudeFt: alt })).toBeCloseTo(ref.GetTWetBulbFromRelHum(db, rh / 100, p), 9);
        expect(dewPointF({ dryBulbF: db, relativeHumidityPct: rh })).toBeCloseTo(ref.GetTDewPointFromRelHum(db, rh / 100), 9);
      }),
      { numRuns: 200 },
    );
  });

  it('wet bulb equals dry bulb at saturation and sits below it otherwise', () => {
    // Definition of thermodynamic wet bulb (ASHRAE Fundamentals ch. 1).
    expect(wetBulbF({ dryBulbF: 75, relativeHumidityPct: 100 })).toBeCloseTo(75, 3);
    expect(wetBulbF({ dryBulbF: 75, relativeHumidityPct: 50 })).toBeLessThan(75);
    expect(dewPointF({ dryBulbF: 75, relativeHumidityPct: 100 })).toBeCloseTo(75, 3);
  });

  it('gives standard-atmosphere pressure by altitude', () => {
    // ASHRAE Fundamentals ch. 1 Table 1: 14.696 psia at sea level, 12.228 psia at 5000 ft.
    expect(atmosphericPressurePsia(0)).toBeCloseTo(14.696, 3);
    expect(atmosphericPressurePsia(5000)).toBeCloseTo(12.228, 2);
  });

  it('is not affected when the shared psychrolib instance is switched to SI', () => {
    const before = wetBulbF({ dryBulbF: 80, relativeHumidityPct: 50 });
    psychrolib.SetUnitSystem(psychrolib.SI);
    expect(wetBulbF({ dryBulbF: 80, relativeHumidityPct: 50 })).toBe(before);
  });

  it('rejects impossible air readings, naming the field', () => {
    expect(fieldOf(() => wetBulbF({ dryBulbF: 75, relativeHumidityPct: 101 }))).toBe('relativeHumidityPct');
    expect(fieldOf(() => wetBulbF({ dryBulbF: 75, relativeHumidityPct: -1 }))).toBe('relativeHumidityPct');
    expect(fieldOf(() => dewPointF({ dryBulbF: 75, relativeHumidityPct: 0 }))).toBe('relativeHumidityPct');
    expect(fieldOf(() => dewPointF({ dryBulbF: Number.NaN, relativeHumidityPct: 50 }))).toBe('dryBulbF');
    expect(fieldOf(() => wetBulbF({ dryBulbF: 75, relativeHumidityPct: 50, altitudeFt: 40000 }))).toBe('altitudeFt');
    expect(fieldOf(() => moistAirFromWetBulb({ dryBulbF: 70, wetBulbF: 75 }))).toBe('wetBulbF');
  });
});
