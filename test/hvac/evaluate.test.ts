import { describe, expect, it } from 'vitest';
import { ReadingInputError, evaluateReadings, saturationPressurePsig, visitReadingsSchema, wetBulbF, type ReadingCheck, type VisitReadings } from '../../shared/hvac';

function only(r: VisitReadings, check: string): ReadingCheck {
  const found = evaluateReadings(r).filter((c) => c.check === check);
  expect(found).toHaveLength(1);
  return found[0]!;
}

function fieldOf(r: unknown): string {
  try {
    evaluateReadings(r as VisitReadings);
  } catch (e) {
    if (e instanceof ReadingInputError) return e.field;
    throw e;
  }
  throw new Error('expected a ReadingInputError');
}

// R-410A suction pressure whose dew point is 45 °F, liquid pressure whose bubble point is 105 °F.
const suction45 = saturationPressurePsig('R-410A', 45, 'dew');
const liquid105 = saturationPressurePsig('R-410A', 105, 'bubble');

describe('cooling temperature split', () => {
  it('75 °F return and 55 °F supply at 61 °F wet bulb is a 20 °F split, in range', () => {
    // Title 24 RA3.2 target split at 75 °F DB / 61 °F WB: 19.9 °F, ±3 °F (table cells from memory, data/target-split.csv).
    const c = only({ mode: 'cooling', returnDryBulbF: 75, supplyDryBulbF: 55, indoorWetBulbF: 61 }, 'temperature_split');
    expect(c).toMatchObject({ value: 20, unit: '°F', status: 'ok', expected: { min: 16.9, max: 22.9, target: 19.9 } });
    expect(c.message).toBe('Split 20.0 °F, target 16.9–22.9 °F (return 75 °F DB, 61 °F WB)');
    expect(c.source).toMatch(/Title 24/);
  });

  it('asks for the return wet bulb or RH instead of guessing a target', () => {
    // The split method's target needs return dry bulb and wet bulb (Title 24 RA3.2).
    const c = only({ mode: 'cooling', returnDryBulbF: 75, supplyDryBulbF: 55 }, 'temperature_split');
    expect(c).toMatchObject({ value: 20, status: 'watch', expected: {} });
    expect(c.message).toMatch(/wet bulb or RH needed/);
  });

  it('lowers the target when the return air is humid, from the table rather than an adjustment', () => {
    // Humid return air puts more of the coil's work into moisture removal, so the split falls (Title 24 RA3.2 table, from memory).
    const c = only({ returnDryBulbF: 75, supplyDryBulbF: 60, returnRelativeHumidityPct: 70 }, 'temperature_split');
    expect(c.status).toBe('ok');
    expect(c.source).toMatch(/RH/);
    const dry = only({ returnDryBulbF: 75, supplyDryBulbF: 60, returnRelativeHumidityPct: 40 }, 'temperature_split');
    expect(dry.expected.target!).toBeGreaterThan(c.expected.target! + 5);
    expect(dry.status).not.toBe('ok');
    expect(c.source).not.toMatch(/per 10 %/);
  });

  it('grades a split outside the band as watch, then alert', () => {
    // ±3 °F band (Title 24 RA3.2, from memory); 2 °F beyond it is our watch margin.
    expect(only({ returnDryBulbF: 75, supplyDryBulbF: 60, indoorWetBulbF: 61 }, 'temperature_split').status).toBe('watch'); // 15 °F
    expect(only({ returnDryBulbF: 75, supplyDryBulbF: 62, indoorWetBulbF: 61 }, 'temperature_split').status).toBe('alert'); // 13 °F
    expect(only({ returnDryBulbF: 78, supplyDryBulbF: 50, indoorWetBulbF: 61 }, 'temperature_split').status).toBe('alert'); // 28 °F
  });

  it('rejects supply warmer than return in cooling', () => {
    expect(fieldOf({ mode: 'cooling', returnDryBulbF: 75, supplyDryBulbF: 80 })).toBe('supplyDryBulbF');
  });
});

describe('furnace temperature rise', () => {
  it('checks the rise against the nameplate range', () => {
    // Furnace nameplate rise range, e.g. 35–65 °F (manufacturer's rating plate).
    const ok = only({ mode: 'heating', temperatureRiseF: 45, riseRangeF: { min: 35, max: 65 } }, 'temperature_rise');
    expect(ok).toMatchObject({ status: 'ok', expected: { min: 35, max: 65 } });
    expect(ok.message).toBe('Rise 45.0 °F, nameplate 35–65 °F');
    expect(only({ mode: 'heating', temperatureRiseF: 72, riseRangeF: { min: 35, max: 65 } }, 'temperature_rise').status).toBe('alert');
  });

  it('computes the rise from supply minus return in heating', () => {
    const c = only({ mode: 'heating', returnDryBulbF: 68, supplyDryBulbF: 118, riseRangeF: { min: 40, max: 70 } }, 'temperature_rise');
    expect(c.value).toBe(50);
    expect(evaluateReadings({ mode: 'heating', returnDryBulbF: 68, supplyDryBulbF: 118 }).map((x) => x.check)).not.toContain('temperature_split');
  });

  it('asks for the nameplate range when none is entered', () => {
    const c = only({ mode: 'heating', temperatureRiseF: 45 }, 'temperature_rise');
    expect(c.status).toBe('watch');
    expect(c.message).toMatch(/range needed/);
  });

  it('rejects supply cooler than return in heating', () => {
    expect(fieldOf({ mode: 'heating', returnDryBulbF: 70, supplyDryBulbF: 60 })).toBe('supplyDryBulbF');
  });
});

describe('superheat', () => {
  const fixed = { refrigerant: 'R-410A', meteringDevice: 'fixed', suctionPressurePsig: suction45, outdoorDryBulbF: 96 } as const;

  it('fixed orifice: 8 °F target at 64 °F WB and 96 °F DB, ±5 °F', () => {
    // ((3 × 64) − 80 − 96) / 2 = 8 °F (common practice; service literature).
    const c = only({ ...fixed, suctionLineTempF: 53, indoorWetBulbF: 64 }, 'superheat');
    expect(c).toMatchObject({ value: 8, status: 'ok', expected: { min: 3, max: 13, target: 8 } });
    expect(c.source).toMatch(/3 × indoor WB/);
    expect(only({ ...fixed, suctionLineTempF: 65, indoorWetBulbF: 64 }, 'superheat').status).toBe('alert'); // 20 °F
    expect(only({ ...fixed, suctionLineTempF: 47, indoorWetBulbF: 64 }, 'superheat').status).toBe('alert'); // 2 °F
  });

  it('fixed orifice: works the indoor wet bulb out from return dry bulb and RH', () => {
    const wb = wetBulbF({ dryBulbF: 76, relativeHumidityPct: 55 });
    const c = only({ ...fixed, suctionLineTempF: 55, returnDryBulbF: 76, returnRelativeHumidityPct: 55 }, 'superheat');
    expect(c.expected.target).toBeCloseTo((3 * wb - 80 - 96) / 2, 1); // fixed-orifice method (common practice)
    expect(c.source).toMatch(/psychrolib/);
  });

  it('fixed orifice: does not judge where the method says not to charge by superheat', () => {
    const c = only({ ...fixed, suctionLineTempF: 50, indoorWetBulbF: 60, outdoorDryBulbF: 100 }, 'superheat');
    expect(c.status).toBe('watch');
    expect(c.expected).toEqual({});
    expect(c.message).toMatch(/do not charge by superheat/);
  });

  it('TXV: uses the manufacturer range when entered, else 8–12 °F', () => {
    const txv = { refrigerant: 'R-410A', meteringDevice: 'txv', suctionPressurePsig: suction45 } as const;
    // 8–12 °F default at a TXV (common practice).
    expect(only({ ...txv, suctionLineTempF: 55 }, 'superheat')).toMatchObject({ status: 'ok', expected: { min: 8, max: 12 } });
    const off = only({ ...txv, suctionLineTempF: 62 }, 'superheat');
    expect(off.status).toBe('watch');
    expect(off.source).toMatch(/common practice/i);
    const given = only({ ...txv, suctionLineTempF: 62, manufacturerSuperheatRangeF: { min: 5, max: 10 } }, 'superheat');
    expect(given).toMatchObject({ status: 'alert', expected: { min: 5, max: 10 } });
    expect(given.source).toMatch(/Manufacturer/);
  });

  it('asks for the metering device when it is missing', () => {
    const c = only({ refrigerant: 'R-22', suctionPressurePsig: 70, suctionLineTempF: 50 }, 'superheat');
    expect(c.status).toBe('watch');
    expect(c.message).toMatch(/metering device needed/);
  });
});

describe('subcooling', () => {
  const liquid = { refrigerant: 'R-410A', liquidPressurePsig: liquid105 } as const;

  it('checks against the nameplate target ±3 °F', () => {
    // Nameplate subcooling target ±3 °F (common practice).
    const c = only({ ...liquid, liquidLineTempF: 95, subcoolingTargetF: 10 }, 'subcooling');
    expect(c).toMatchObject({ value: 10, status: 'ok', expected: { min: 7, max: 13, target: 10 } });
    expect(only({ ...liquid, liquidLineTempF: 91, subcoolingTargetF: 10 }, 'subcooling').status).toBe('alert');
  });

  it('asks for the target when none is entered', () => {
    expect(only({ ...liquid, liquidLineTempF: 95 }, 'subcooling').status).toBe('watch');
  });
});

describe('run capacitors', () => {
  it('7.5 µF rated measuring 6.9 µF is out of ±6 %', () => {
    // ±6 % run capacitor tolerance (common practice): 7.05–7.95 µF.
    const c = only({ capacitors: { outdoorFan: { ratedUf: 7.5, measuredUf: 6.9 } } }, 'capacitor_outdoor_fan');
    expect(c).toMatchObject({ status: 'alert', unit: 'µF', expected: { min: 7.05, max: 7.95, target: 7.5 } });
  });

  it('uses the tolerance printed on the part', () => {
    const c = only({ capacitors: { compressor: { ratedUf: 45, tolerancePct: 10, measuredUf: 41 } } }, 'capacitor_compressor');
    expect(c).toMatchObject({ status: 'ok', expected: { min: 40.5, max: 49.5 } });
    expect(c.source).toMatch(/printed on the capacitor/);
  });

  it('works µF out from current and voltage under load', () => {
    // 2652 × 2.8 A ÷ 370 V ≈ 20.07 µF (common practice field formula).
    const c = only({ capacitors: { compressor: { ratedUf: 20, measuredAmps: 2.8, measuredVolts: 370 } } }, 'capacitor_compressor');
    expect(c.value).toBeCloseTo(20.07, 1);
    expect(c.status).toBe('ok');
  });

  it('without a rating reports that the rating is needed, not a guess', () => {
    const c = only({ capacitors: { blower: { measuredUf: 5 } } }, 'capacitor_blower');
    expect(c.status).toBe('watch');
    expect(c.expected).toEqual({});
    expect(c.message).toMatch(/rating needed/);
  });

  it('needs voltage along with current', () => {
    expect(fieldOf({ capacitors: { compressor: { ratedUf: 35, measuredAmps: 4 } } })).toBe('capacitors.compressor.measuredVolts');
  });
});

describe('motor amps', () => {
  it('grades against nameplate: over is alert, the last 10 % is watch', () => {
    // Running above nameplate RLA/FLA is an overload (common practice).
    const grade = (a: number) => only({ compressorAmps: a, compressorRatedLoadAmps: 20 }, 'amps_compressor').status;
    expect(grade(18)).toBe('ok');
    expect(grade(19)).toBe('watch');
    expect(grade(21)).toBe('alert');
    const fan = only({ outdoorFanAmps: 1.2, outdoorFanFullLoadAmps: 1.5 }, 'amps_outdoor_fan');
    expect(fan).toMatchObject({ status: 'ok', expected: { max: 1.5 } });
    expect(only({ blowerAmps: 5 }, 'amps_blower').status).toBe('watch');
  });
});

describe('control voltage', () => {
  it('is in range within ±10 % of 24 VAC', () => {
    // 24 VAC nominal class 2 control circuit, ±10 % (common practice).
    const grade = (v: number) => only({ controlVoltageVac: v }, 'control_voltage').status;
    expect(grade(24.3)).toBe('ok');
    expect(grade(21.6)).toBe('ok');
    expect(grade(26.4)).toBe('ok');
    expect(grade(20.5)).toBe('watch');
    expect(grade(27.5)).toBe('watch');
    expect(grade(18)).toBe('alert');
    expect(grade(30)).toBe('alert');
    expect(only({ controlVoltageVac: 24 }, 'control_voltage').expected).toEqual({ min: 21.6, max: 26.4, target: 24 });
  });
});

describe('capacity and airflow', () => {
  const base = { returnDryBulbF: 75, supplyDryBulbF: 55, nominalTons: 3 };

  it('sensible capacity is 1.08 × CFM × split against 12,000 Btu/h per ton', () => {
    // 1.08 × 1200 × 20 = 25,920 Btu/h (ASHRAE standard air); 3 tons = 36,000 Btu/h nominal.
    const c = only({ ...base, airflowCfm: 1200 }, 'sensible_capacity');
    expect(c).toMatchObject({ value: 25920, unit: 'Btu/h', status: 'ok', expected: { min: 21600, max: 36000, target: 27000 } });
    expect(c.message).toBe('Sensible 25,920 Btu/h, 72 % of nominal 36,000');
    expect(only({ ...base, supplyDryBulbF: 67, airflowCfm: 1200 }, 'sensible_capacity').status).toBe('alert'); // 8 °F split
  });

  it('airflow per ton against 350–450 CFM', () => {
    // 350–450 CFM per nominal ton (common practice).
    expect(only({ airflowCfm: 1200, nominalTons: 3 }, 'airflow_per_ton')).toMatchObject({
      value: 400,
      status: 'ok',
      expected: { min: 350, max: 450 },
    });
    expect(only({ airflowCfm: 960, nominalTons: 3 }, 'airflow_per_ton').status).toBe('watch'); // 320
    expect(only({ airflowCfm: 800, nominalTons: 3 }, 'airflow_per_ton').status).toBe('alert'); // 267
  });
});

describe('a full visit', () => {
  const visit: VisitReadings = {
    mode: 'cooling',
    altitudeFt: 800,
    returnDryBulbF: 76,
    supplyDryBulbF: 56,
    returnRelativeHumidityPct: 50,
    outdoorDryBulbF: 92,
    refrigerant: 'R-410A',
    meteringDevice: 'txv',
    suctionPressurePsig: suction45,
    suctionLineTempF: 55,
    liquidPressurePsig: liquid105,
    liquidLineTempF: 95,
    subcoolingTargetF: 10,
    capacitors: { compressor: { ratedUf: 45, measuredUf: 44 }, outdoorFan: { ratedUf: 5, measuredUf: 4.9 } },
    compressorAmps: 14,
    compressorRatedLoadAmps: 18,
    outdoorFanAmps: 0.9,
    outdoorFanFullLoadAmps: 1.3,
    blowerAmps: 3.5,
    blowerFullLoadAmps: 5,
    controlVoltageVac: 24.5,
    airflowCfm: 1200,
    nominalTons: 3,
  };

  it('returns every check with a band and a source', () => {
    const checks = evaluateReadings(visit);
    expect(checks.map((c) => c.check)).toEqual([
      'temperature_split',
      'superheat',
      'subcooling',
      'capacitor_compressor',
      'capacitor_outdoor_fan',
      'amps_compressor',
      'amps_outdoor_fan',
      'amps_blower',
      'control_voltage',
      'sensible_capacity',
      'airflow_per_ton',
    ]);
    for (const c of checks) {
      expect(c.status).toBe('ok');
      expect(c.source.length).toBeGreaterThan(10);
      expect(c.unit).not.toBe('');
      expect(c.expected.min !== undefined || c.expected.max !== undefined).toBe(true);
      expect(Number.isFinite(c.value)).toBe(true);
      expect(c.message).toMatch(/\d/);
    }
  });

  it('returns nothing for an empty visit', () => {
    expect(evaluateReadings({})).toEqual([]);
  });
});

describe('bad input names the field', () => {
  it.each([
    [{ returnRelativeHumidityPct: 101 }, 'returnRelativeHumidityPct'],
    [{ returnRelativeHumidityPct: -2 }, 'returnRelativeHumidityPct'],
    [{ refrigerant: 'R-410A', suctionPressurePsig: -15, suctionLineTempF: 50 }, 'suctionPressurePsig'],
    [{ refrigerant: 'R-410A', suctionPressurePsig: 700, suctionLineTempF: 50, meteringDevice: 'txv' }, 'suctionPressurePsig'],
    [{ refrigerant: 'R-410A', liquidPressurePsig: 300 }, 'liquidLineTempF'],
    [{ suctionPressurePsig: 120, suctionLineTempF: 50 }, 'refrigerant'],
    [{ refrigerant: 'R-12' }, 'refrigerant'],
    [{ returnDryBulbF: Number.NaN }, 'returnDryBulbF'],
    [{ controlVoltageVac: Number.POSITIVE_INFINITY }, 'controlVoltageVac'],
    [{ returnDryBulbF: '75' }, 'returnDryBulbF'],
    [{ riseRangeF: { min: 70, max: 40 } }, 'riseRangeF.max'],
    [{ capacitors: { compressor: { ratedUf: 0, measuredUf: 5 } } }, 'capacitors.compressor.ratedUf'],
    [{ nominalTons: 0, airflowCfm: 800 }, 'nominalTons'],
    [{ returnDryBulb: 75 }, 'returnDryBulb'],
    [{ indoorWetBulbF: 80, returnDryBulbF: 75 }, 'indoorWetBulbF'],
  ])('%j → %s', (input, field) => {
    expect(fieldOf(input)).toBe(field);
  });

  it('carries a readable message with the field', () => {
    try {
      evaluateReadings({ returnRelativeHumidityPct: 120 });
    } catch (e) {
      expect(e).toBeInstanceOf(ReadingInputError);
      expect((e as Error).message).toMatch(/returnRelativeHumidityPct: .*100 %/);
      return;
    }
    throw new Error('expected an error');
  });

  it('the shared schema gives the same verdict the server and client will use', () => {
    const bad = visitReadingsSchema.safeParse({ mode: 'cooling', returnDryBulbF: 70, supplyDryBulbF: 75 });
    expect(bad.success).toBe(false);
    expect(bad.error?.issues[0]?.path).toEqual(['supplyDryBulbF']);
    expect(visitReadingsSchema.safeParse({ returnDryBulbF: 75, supplyDryBulbF: 55 }).success).toBe(true);
  });
});
