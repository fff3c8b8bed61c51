import { describe, expect, it } from 'vitest';
import {
  READING_HELP,
  ReadingInputError,
  evaluateReadings,
  fixedOrificeTarget,
  saturationPressurePsig,
  targetSuperheatF,
  type ReadingCheck,
  type VisitReadings,
} from '../../shared/hvac';

function only(r: VisitReadings, check: string): ReadingCheck {
  const found = evaluateReadings(r).filter((c) => c.check === check);
  expect(found).toHaveLength(1);
  return found[0]!;
}

// R-410A suction pressure whose dew point is 45 °F: a 46 °F suction line is 1 °F of superheat.
const suction45 = saturationPressurePsig('R-410A', 45, 'dew');
const oneDegree = { mode: 'cooling', refrigerant: 'R-410A', suctionPressurePsig: suction45, suctionLineTempF: 46 } as const;

describe('superheat that puts the compressor at risk', () => {
  it.each([
    ['fixed', { meteringDevice: 'fixed', indoorWetBulbF: 64, outdoorDryBulbF: 96 }],
    ['fixed, method not applicable', { meteringDevice: 'fixed', indoorWetBulbF: 64, outdoorDryBulbF: 50 }],
    ['txv', { meteringDevice: 'txv' }],
    ['txv with a manufacturer range', { meteringDevice: 'txv', manufacturerSuperheatRangeF: { min: 0, max: 10 } }],
    ['eev', { meteringDevice: 'eev' }],
    ['no metering device entered', {}],
    ['variable-speed, not in test mode', { meteringDevice: 'eev', compressorType: 'variable_speed', capacityPct: 40 }],
  ] as const)('1 °F with %s is an alert', (_name, extra) => {
    // Under 5 °F at the service port liquid may reach the compressor (common practice; piston charging charts state this floor).
    const c = only({ ...oneDegree, ...extra } as VisitReadings, 'superheat');
    expect(c.value).toBe(1);
    expect(c.status).toBe('alert');
    expect(c.message).toMatch(/liquid may be reaching the compressor/);
    expect(c.source).toMatch(/common practice/i);
  });

  it('5 °F is not caught by the floor', () => {
    const c = only({ ...oneDegree, suctionLineTempF: 50, meteringDevice: 'txv' }, 'superheat');
    expect(c.status).not.toBe('alert'); // 5 °F: inside the 4–25 °F TXV band (Title 24 RA3.2, from memory)
  });
});

describe('TXV and EEV with no manufacturer range', () => {
  const txv = (lineF: number, device: 'txv' | 'eev' = 'txv') =>
    only({ refrigerant: 'R-410A', meteringDevice: device, suctionPressurePsig: suction45, suctionLineTempF: lineF }, 'superheat');

  it('rates 8–12 °F ok, up to 4–25 °F watch, outside 4–25 °F alert', () => {
    // 8–12 °F usual band (common practice); outside 4–25 °F is an alert (Title 24 RA3.2 subcooling method, from memory).
    expect(txv(55).status).toBe('ok'); // 10 °F
    expect(txv(51).status).toBe('watch'); // 6 °F
    expect(txv(70).status).toBe('watch'); // 25 °F
    expect(txv(71).status).toBe('alert'); // 26 °F
    expect(txv(75, 'eev').status).toBe('alert'); // 30 °F
    expect(txv(71).source).toMatch(/4–25 °F.*Title 24.*from memory/);
  });
});

describe('fixed-orifice target superheat', () => {
  const fixed = { refrigerant: 'R-410A', meteringDevice: 'fixed', suctionPressurePsig: suction45 } as const;

  it('cites Title 24 RA3.2 for the ±5 °F band', () => {
    // ((3 × 64) − 80 − 96) / 2 = 8 °F, ±5 °F (Title 24 Reference Appendix RA3.2).
    const c = only({ ...fixed, suctionLineTempF: 53, indoorWetBulbF: 64, outdoorDryBulbF: 96 }, 'superheat');
    expect(c).toMatchObject({ status: 'ok', expected: { min: 3, max: 13, target: 8 } });
    expect(c.source).toMatch(/±5 °F \(Title 24 Reference Appendix RA3.2\)/);
  });

  it('does not apply below 55 °F outdoors or outside the chart’s wet bulbs', () => {
    // Chart range 55–115 °F outdoor, 50–76 °F indoor wet bulb (Title 24 RA3.2 target superheat table, from memory).
    expect(fixedOrificeTarget({ indoorWetBulbF: 64, outdoorDryBulbF: 54 })).toMatchObject({ kind: 'outside_chart' });
    expect(fixedOrificeTarget({ indoorWetBulbF: 64, outdoorDryBulbF: 116 })).toMatchObject({ kind: 'outside_chart' });
    expect(fixedOrificeTarget({ indoorWetBulbF: 49, outdoorDryBulbF: 80 })).toMatchObject({ kind: 'outside_chart' });
    expect(fixedOrificeTarget({ indoorWetBulbF: 77, outdoorDryBulbF: 80 })).toMatchObject({ kind: 'outside_chart' });
    expect(targetSuperheatF({ indoorWetBulbF: 64, outdoorDryBulbF: 50 })).toBeNull();
    // At 50 °F outdoors the formula alone would say 31 °F; the method gives no target there.
    const c = only({ ...fixed, suctionLineTempF: 60, indoorWetBulbF: 64, outdoorDryBulbF: 50 }, 'superheat');
    expect(c).toMatchObject({ status: 'watch', expected: {} });
    expect(c.message).toMatch(/method does not apply: outdoor 50 °F is below the chart's 55 °F/);
  });

  it('does not verify where the target is under 5 °F (Title 24 RA3.2)', () => {
    expect(fixedOrificeTarget({ indoorWetBulbF: 60, outdoorDryBulbF: 100 })).toEqual({ kind: 'below_minimum', formulaF: 0 });
    const c = only({ ...fixed, suctionLineTempF: 52, indoorWetBulbF: 60, outdoorDryBulbF: 100 }, 'superheat');
    expect(c).toMatchObject({ status: 'watch', expected: {} });
    expect(c.source).toMatch(/Title 24 RA3.2 does not verify charge/);
  });
});

describe('compressor current', () => {
  it('0 A against a rated 18 A is an alert: compressor not running', () => {
    // A compressor that should run draws far more than 10 % of its RLA (common practice).
    const c = only({ compressorAmps: 0, compressorRatedLoadAmps: 18 }, 'amps_compressor');
    expect(c.status).toBe('alert');
    expect(c.message).toMatch(/compressor not running/);
    expect(c.expected).toEqual({ min: 1.8, max: 18 });
  });

  it('near zero with no rating is still not running', () => {
    expect(only({ compressorAmps: 0.2 }, 'amps_compressor')).toMatchObject({ status: 'alert' });
    expect(only({ compressorAmps: 12 }, 'amps_compressor')).toMatchObject({ status: 'watch', expected: {} });
  });

  it('judges running current against RLA with named limits, and says RLA is a rating', () => {
    // Above RLA is an overload; the last 10 % below it is watch (common practice); RLA per UL 1995 (from memory).
    expect(only({ compressorAmps: 14, compressorRatedLoadAmps: 18 }, 'amps_compressor').status).toBe('ok');
    expect(only({ compressorAmps: 17, compressorRatedLoadAmps: 18 }, 'amps_compressor').status).toBe('watch');
    const over = only({ compressorAmps: 19, compressorRatedLoadAmps: 18 }, 'amps_compressor');
    expect(over.status).toBe('alert');
    expect(over.source).toMatch(/a rating and not the expected running current/);
    expect(over.source).toMatch(/UL 1995/);
    expect(READING_HELP.compressorRatedLoadAmps).toMatch(/RLA is a rating, not the current the compressor is expected to draw/);
  });
});

describe('new inputs are optional, unknown ones are refused by name', () => {
  it('refuses a misspelt field naming it', () => {
    try {
      evaluateReadings({ compressorHertz: 40 } as unknown as VisitReadings);
    } catch (e) {
      expect(e).toBeInstanceOf(ReadingInputError);
      expect((e as ReadingInputError).field).toBe('compressorHertz');
      expect((e as Error).message).toMatch(/unknown field "compressorHertz"/);
      return;
    }
    throw new Error('expected a ReadingInputError');
  });
});
