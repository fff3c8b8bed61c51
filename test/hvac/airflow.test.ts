import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { ReadingInputError, airflowPerTonCfm, nominalCapacityBtuh, sensibleCapacityBtuh } from '../../shared/hvac';

describe('sensible capacity and airflow', () => {
  it('is 1.08 × CFM × ΔT for standard air', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 3000, noNaN: true }), fc.double({ min: 0, max: 40, noNaN: true }), (cfm, dt) => {
        // Q = 1.08 × CFM × ΔT, standard air 0.075 lb/ft³ (ASHRAE Fundamentals; common practice).
        expect(sensibleCapacityBtuh({ airflowCfm: cfm, temperatureSplitF: dt })).toBeCloseTo(1.08 * cfm * dt, 8);
      }),
    );
    // 1200 CFM at a 20 °F split: 25,920 Btu/h (1.08 × 1200 × 20, ASHRAE standard air).
    expect(sensibleCapacityBtuh({ airflowCfm: 1200, temperatureSplitF: 20 })).toBeCloseTo(25920, 6);
  });

  it('rates a ton at 12,000 Btu/h and divides airflow by tons', () => {
    // One ton of refrigeration = 12,000 Btu/h (definition).
    expect(nominalCapacityBtuh(3)).toBe(36000);
    expect(airflowPerTonCfm({ airflowCfm: 1200, nominalTons: 3 })).toBe(400);
  });

  it('names bad inputs', () => {
    const f = (fn: () => unknown) => {
      try {
        fn();
      } catch (e) {
        return (e as ReadingInputError).field;
      }
      return null;
    };
    expect(f(() => sensibleCapacityBtuh({ airflowCfm: -5, temperatureSplitF: 20 }))).toBe('airflowCfm');
    expect(f(() => sensibleCapacityBtuh({ airflowCfm: 800, temperatureSplitF: Number.NaN }))).toBe('temperatureSplitF');
    expect(f(() => airflowPerTonCfm({ airflowCfm: 800, nominalTons: 0 }))).toBe('nominalTons');
  });
});
