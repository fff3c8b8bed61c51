import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { SATURATION_TABLE } from '../../shared/hvac/data/saturation-table';
import { REFRIGERANTS, ReadingInputError, saturationPressurePsig, saturationTemperatureF, subcoolingF, superheatF, type Refrigerant } from '../../shared/hvac';

const csvPath = fileURLToPath(new URL('../../shared/hvac/data/refrigerant-saturation.csv', import.meta.url));
const rows = readFileSync(csvPath, 'utf8')
  .trim()
  .split(/\r?\n/)
  .slice(1)
  .map((line) => {
    const [refrigerant, t, bubble, dew] = line.split(',');
    return { refrigerant: refrigerant!, t: Number(t), bubble: Number(bubble), dew: Number(dew) };
  });

function thrown(fn: () => unknown): ReadingInputError {
  try {
    fn();
  } catch (e) {
    if (e instanceof ReadingInputError) return e;
    throw e;
  }
  throw new Error('expected a ReadingInputError');
}

describe('generated saturation table', () => {
  it('holds exactly the CSV rows', () => {
    const fromModule = Object.entries(SATURATION_TABLE).flatMap(([refrigerant, r]) => r.tempF.map((t, k) => ({ refrigerant, t, bubble: r.bubblePsig[k], dew: r.dewPsig[k] })));
    expect(fromModule).toEqual(rows);
    expect(Object.keys(SATURATION_TABLE).sort()).toEqual([...REFRIGERANTS].sort());
  });

  it('has pressure rising strictly with temperature, so it can be inverted', () => {
    for (const r of Object.values(SATURATION_TABLE)) {
      for (let k = 1; k < r.tempF.length; k++) {
        expect(r.bubblePsig[k]!).toBeGreaterThan(r.bubblePsig[k - 1]!);
        expect(r.dewPsig[k]!).toBeGreaterThan(r.dewPsig[k - 1]!);
      }
    }
  });

  it('puts the bubble point at or above the dew point at every temperature', () => {
    // A zeotropic blend boils (bubble) at a higher pressure than it condenses fully (dew); pure fluids are equal (thermodynamics).
    for (const row of rows) expect(row.bubble).toBeGreaterThanOrEqual(row.dew);
  });
});

describe('saturation pressure and temperature', () => {
  it.each([
    [40, 118.0],
    [45, 129.7],
    [100, 317.2],
    [110, 365.0],
  ])('R-410A at %d °F is within 1.5 psi of %d psig', (t, chart) => {
    // A manufacturer's published R-410A pressure-temperature chart (cross-check quoted in data/README.md).
    expect(Math.abs(saturationPressurePsig('R-410A', t, 'bubble') - chart)).toBeLessThanOrEqual(1.5);
    expect(Math.abs(saturationPressurePsig('R-410A', t, 'dew') - chart)).toBeLessThanOrEqual(1.5);
  });

  it('matches common R-22 chart points', () => {
    // R-22 PT chart: 68.5 psig at 40 °F and 195.9 psig at 100 °F (from memory).
    expect(saturationPressurePsig('R-22', 40, 'dew')).toBeCloseTo(68.5, 0);
    expect(saturationPressurePsig('R-22', 100, 'bubble')).toBeCloseTo(195.9, 0);
  });

  it('interpolates linearly between rows', () => {
    const lo = saturationPressurePsig('R-410A', 40, 'dew');
    const hi = saturationPressurePsig('R-410A', 41, 'dew');
    expect(saturationPressurePsig('R-410A', 40.25, 'dew')).toBeCloseTo(lo + 0.25 * (hi - lo), 10);
    expect(saturationTemperatureF('R-410A', (lo + hi) / 2, 'dew')).toBeCloseTo(40.5, 10);
  });

  it('interpolates R-454B across the missing rows above 133 °F', () => {
    // CSV rows: 133 °F 471.18 psig and 138 °F 501.52 psig bubble; 134-137 °F are absent.
    const p = saturationPressurePsig('R-454B', 135.5, 'bubble');
    expect(p).toBeCloseTo(471.18 + (501.52 - 471.18) / 2, 6);
    expect(saturationTemperatureF('R-454B', p, 'bubble')).toBeCloseTo(135.5, 6);
  });

  it('gives R-454B a temperature glide of about 1-3 °F', () => {
    // R-454B temperature glide is roughly 1.5-2 °F at air-conditioning pressures (from memory).
    const glide = saturationTemperatureF('R-454B', 130, 'dew') - saturationTemperatureF('R-454B', 130, 'bubble');
    expect(glide).toBeGreaterThan(1);
    expect(glide).toBeLessThan(3);
  });

  it('inverts: temperature from the pressure at a temperature gives it back', () => {
    fc.assert(
      fc.property(
        fc.constantFrom<Refrigerant>(...REFRIGERANTS),
        fc.constantFrom<'bubble' | 'dew'>('bubble', 'dew'),
        fc.double({ min: -40, max: 150, noNaN: true }),
        (ref, point, t) => {
          const p = saturationPressurePsig(ref, t, point);
          expect(saturationTemperatureF(ref, p, point)).toBeCloseTo(t, 8);
        },
      ),
    );
  });

  it('inverts: pressure from the temperature at a pressure gives it back', () => {
    fc.assert(
      fc.property(fc.constantFrom<Refrigerant>(...REFRIGERANTS), fc.double({ min: 0, max: 1, noNaN: true }), (ref, f) => {
        const r = SATURATION_TABLE[ref]!;
        const p = r.dewPsig[0]! + f * (r.dewPsig.at(-1)! - r.dewPsig[0]!);
        expect(saturationPressurePsig(ref, saturationTemperatureF(ref, p, 'dew'), 'dew')).toBeCloseTo(p, 8);
      }),
    );
  });

  it('rejects readings outside the table, naming the field and the range', () => {
    const hot = thrown(() => saturationPressurePsig('R-410A', 151, 'dew'));
    expect(hot.field).toBe('temperatureF');
    expect(hot.message).toMatch(/-40 to 150 °F/);
    const high = thrown(() => saturationTemperatureF('R-22', 900, 'bubble'));
    expect(high.field).toBe('pressurePsig');
    expect(high.message).toMatch(/psig/);
    const vacuum = thrown(() => saturationTemperatureF('R-410A', -15, 'dew'));
    expect(vacuum.field).toBe('pressurePsig');
    expect(vacuum.message).toMatch(/vacuum/);
    expect(thrown(() => saturationTemperatureF('R-410A', Number.NaN, 'dew')).field).toBe('pressurePsig');
    expect(thrown(() => saturationPressurePsig('R-410A', Number.POSITIVE_INFINITY, 'dew')).field).toBe('temperatureF');
  });

  it('rejects an unknown refrigerant or point by name', () => {
    expect(thrown(() => saturationPressurePsig('R-12' as Refrigerant, 40, 'dew')).field).toBe('refrigerant');
    expect(thrown(() => saturationPressurePsig('R-22', 40, 'liquid' as 'dew')).field).toBe('point');
  });
});

describe('superheat and subcooling', () => {
  it('superheat is suction line temperature above the dew point at suction pressure', () => {
    const p = saturationPressurePsig('R-410A', 45, 'dew');
    expect(superheatF({ refrigerant: 'R-410A', suctionPressurePsig: p, suctionLineTempF: 55 })).toBeCloseTo(10, 8);
  });

  it('subcooling is the bubble point at liquid pressure above the liquid line temperature', () => {
    const p = saturationPressurePsig('R-454B', 110, 'bubble');
    expect(subcoolingF({ refrigerant: 'R-454B', liquidPressurePsig: p, liquidLineTempF: 100 })).toBeCloseTo(10, 8);
  });

  it('uses the dew point for superheat and the bubble point for subcooling on a blend', () => {
    // Blends: bubble point for liquid, dew point for vapour (standard practice for zeotropes).
    const p = 130;
    const dewT = saturationTemperatureF('R-454B', p, 'dew');
    const bubbleT = saturationTemperatureF('R-454B', p, 'bubble');
    expect(superheatF({ refrigerant: 'R-454B', suctionPressurePsig: p, suctionLineTempF: 60 })).toBeCloseTo(60 - dewT, 10);
    expect(subcoolingF({ refrigerant: 'R-454B', liquidPressurePsig: p, liquidLineTempF: 30 })).toBeCloseTo(bubbleT - 30, 10);
  });

  it('superheat rises with suction line temperature at a fixed pressure', () => {
    fc.assert(
      fc.property(
        fc.constantFrom<Refrigerant>(...REFRIGERANTS),
        fc.double({ min: 60, max: 200, noNaN: true }),
        fc.double({ min: 0, max: 120, noNaN: true }),
        fc.double({ min: 0.01, max: 40, noNaN: true }),
        (ref, p, t, dt) => {
          const a = superheatF({ refrigerant: ref, suctionPressurePsig: p, suctionLineTempF: t });
          const b = superheatF({ refrigerant: ref, suctionPressurePsig: p, suctionLineTempF: t + dt });
          expect(b).toBeGreaterThan(a);
          expect(b - a).toBeCloseTo(dt, 8);
        },
      ),
    );
  });

  it('names the line reading that is out of range', () => {
    expect(thrown(() => superheatF({ refrigerant: 'R-410A', suctionPressurePsig: -20, suctionLineTempF: 50 })).field).toBe('suctionPressurePsig');
    expect(thrown(() => superheatF({ refrigerant: 'R-410A', suctionPressurePsig: 120, suctionLineTempF: Number.NaN })).field).toBe('suctionLineTempF');
    expect(thrown(() => subcoolingF({ refrigerant: 'R-22', liquidPressurePsig: 5000, liquidLineTempF: 90 })).field).toBe('liquidPressurePsig');
  });
});

describe('R-407C', () => {
  it.each([
    [40, 81, 63],
    [100, 226, 196],
  ])('at %d °F is within 2 psi of a published chart: bubble %d, dew %d psig', (t, bubble, dew) => {
    // A refrigerant maker's published R-407C pressure-temperature chart, liquid (bubble) and vapour (dew) columns,
    // rounded to the psi (from memory).
    expect(Math.abs(saturationPressurePsig('R-407C', t, 'bubble') - bubble)).toBeLessThanOrEqual(2);
    expect(Math.abs(saturationPressurePsig('R-407C', t, 'dew') - dew)).toBeLessThanOrEqual(2);
  });

  it('has a glide of about 10 °F, so superheat and subcooling read different points', () => {
    // R-407C glide is about 10 °F at evaporator and condenser pressures (ASHRAE 34 lists it as a zeotropic 400-series blend; data/README.md).
    const p = saturationPressurePsig('R-407C', 40, 'bubble');
    const glide = saturationTemperatureF('R-407C', p, 'dew') - 40;
    expect(glide).toBeGreaterThan(8);
    expect(glide).toBeLessThan(12);
    // Suction at the 45 °F dew pressure and a 55 °F line is 10 °F superheat; read off the bubble column it would look like ~20 °F.
    const suction = saturationPressurePsig('R-407C', 45, 'dew');
    expect(superheatF({ refrigerant: 'R-407C', suctionPressurePsig: suction, suctionLineTempF: 55 })).toBeCloseTo(10, 6);
    const liquid = saturationPressurePsig('R-407C', 105, 'bubble');
    expect(subcoolingF({ refrigerant: 'R-407C', liquidPressurePsig: liquid, liquidLineTempF: 95 })).toBeCloseTo(10, 6);
  });
});
