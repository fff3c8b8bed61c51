import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { ReadingInputError, microfaradsFromCurrent } from '../../shared/hvac';

describe('run capacitor µF from current', () => {
  it('is 2652 × A ÷ V at 60 Hz', () => {
    fc.assert(
      fc.property(fc.double({ min: 0.1, max: 20, noNaN: true }), fc.double({ min: 100, max: 480, noNaN: true }), (a, v) => {
        // µF = 2652 × A ÷ V at 60 Hz (common practice field formula; 10^6 / (2π × 60) = 2652.6).
        expect(Math.abs(microfaradsFromCurrent({ amps: a, volts: v }) / ((2652 * a) / v) - 1)).toBeLessThan(0.0003);
      }),
    );
  });

  it('uses the capacitive reactance formula at other frequencies', () => {
    // Xc = 1 / (2π f C), so C = I / (2π f V) (circuit theory).
    expect(microfaradsFromCurrent({ amps: 2.5, volts: 370, hz: 50 })).toBeCloseTo((1e6 * 2.5) / (2 * Math.PI * 50 * 370), 10);
    expect(microfaradsFromCurrent({ amps: 1.4, volts: 370 })).toBeCloseTo(10.04, 2);
  });

  it('names bad inputs', () => {
    const f = (i: { amps: number; volts: number; hz?: number }) => {
      try {
        microfaradsFromCurrent(i);
      } catch (e) {
        return (e as ReadingInputError).field;
      }
      return null;
    };
    expect(f({ amps: -1, volts: 240 })).toBe('amps');
    expect(f({ amps: 1, volts: 0 })).toBe('volts');
    expect(f({ amps: 1, volts: 240, hz: Number.NaN })).toBe('hz');
  });
});
