import { describe, expect, it } from 'vitest';
import {
  FULL_CAPACITY_TEST_PROMPT,
  ReadingInputError,
  capacityPctFromFrequency,
  capacityState,
  evaluateReadings,
  homeownerWording,
  saturationPressurePsig,
  type ReadingCheck,
  type VisitReadings,
} from '../../shared/hvac';

const byCheck = (r: VisitReadings): Record<string, ReadingCheck> => Object.fromEntries(evaluateReadings(r).map((c) => [c.check, c]));

// A 3-ton inverter heat pump with an EEV, maximum compressor frequency 90 Hz (the model's nameplate figure in this example).
const unit = {
  mode: 'cooling',
  refrigerant: 'R-410A',
  meteringDevice: 'eev',
  compressorType: 'variable_speed',
  maxCompressorHz: 90,
  nominalTons: 3,
  subcoolingTargetF: 10,
  returnDryBulbF: 75,
  indoorWetBulbF: 61,
} as const;
// R-410A at a 45 °F dew point and a 105 °F bubble point (data/refrigerant-saturation.csv).
const suction = saturationPressurePsig('R-410A', 45, 'dew');
const liquid = saturationPressurePsig('R-410A', 105, 'bubble');

describe('percent of capacity', () => {
  it('is the frequency over the model’s maximum', () => {
    // Inverter compressor capacity roughly in proportion to speed (common practice): 36 Hz of 90 Hz = 40 %.
    expect(capacityPctFromFrequency({ compressorHz: 36, maxCompressorHz: 90 })).toBe(40);
    expect(capacityState({ compressorType: 'variable_speed', compressorHz: 36, maxCompressorHz: 90 })).toMatchObject({ pct: 40, pctFromFrequency: true, judgeCharge: false });
    expect(capacityState({ compressorType: 'variable_speed', compressorHz: 36, maxCompressorHz: 90, fullCapacityTest: true })).toMatchObject({ pct: 100, judgeCharge: true });
    expect(capacityState({})).toMatchObject({ pct: 100, judgeCharge: true });
  });

  it('refuses a frequency above the maximum, naming the field', () => {
    expect(() => capacityPctFromFrequency({ compressorHz: 95, maxCompressorHz: 90 })).toThrow(ReadingInputError);
    try {
      evaluateReadings({ compressorType: 'variable_speed', compressorHz: 95, maxCompressorHz: 90 });
    } catch (e) {
      expect((e as ReadingInputError).field).toBe('compressorHz');
      return;
    }
    throw new Error('expected a ReadingInputError');
  });
});

describe('a variable-speed unit at 40 %', () => {
  // At 40 % with the blower slowed in step: 480 CFM on 3 tons (160 CFM/ton), an 18 °F split.
  const at40: VisitReadings = {
    ...unit,
    compressorHz: 36,
    supplyDryBulbF: 57,
    suctionPressurePsig: suction,
    suctionLineTempF: 55,
    liquidPressurePsig: liquid,
    liquidLineTempF: 99,
    airflowCfm: 480,
  };

  it('shows the charge readings with no verdict and asks for the test mode', () => {
    const c = byCheck(at40);
    for (const id of ['superheat', 'subcooling'] as const) {
      expect(c[id]!.expected).toEqual({});
      expect(c[id]!.status).toBe('watch');
      expect(c[id]!.message).toContain(FULL_CAPACITY_TEST_PROMPT);
      expect(c[id]!.message).toContain('at 40 % of capacity');
    }
    expect(c.superheat!.value).toBe(10);
    expect(c.subcooling!.value).toBe(6); // would be an alert against 10 ± 3 at full capacity
    expect(FULL_CAPACITY_TEST_PROMPT).toBe('put the system in its full-capacity test mode to judge the charge');
    // The homeowner is told it needs another test, not that something is wrong.
    expect(homeownerWording(c.subcooling!)).not.toMatch(/outside/);
  });

  it('scales airflow, split and capacity so part load raises no false alarm', () => {
    const c = byCheck(at40);
    // 350–450 CFM/ton at full capacity (common practice); the floor × 0.40 = 140 at 40 %.
    expect(c.airflow_per_ton).toMatchObject({ value: 160, status: 'ok', expected: { min: 140, max: 450 } });
    // Title 24 RA3.2 target 19.9 °F at 75/61 (table, from memory): low end 19.9 × 0.4 − 3 = 5 °F at 40 %.
    expect(c.temperature_split).toMatchObject({ value: 18, status: 'ok', expected: { min: 5, max: 22.9, target: 19.9 } });
    // 1.08 × 480 × 18 = 9,331 Btu/h against 40 % of 36,000 = 14,400: 60–100 % of it (common practice, scaled).
    expect(c.sensible_capacity).toMatchObject({ value: 9331, status: 'ok', expected: { min: 8640, max: 14400, target: 10800 } });
    // The same readings judged as a fixed-speed unit at full capacity alarm.
    const asFull = byCheck({ ...at40, compressorType: 'fixed_speed', compressorHz: undefined, maxCompressorHz: undefined });
    expect(asFull.airflow_per_ton!.status).toBe('alert');
    expect(asFull.sensible_capacity!.status).toBe('alert');
  });

  it('with the blower left at full speed, a small split is expected too', () => {
    // 1200 CFM and 40 % capacity: the split falls to about 19.9 × 0.4 ≈ 8 °F (sensible heat 1.08 × CFM × ΔT).
    const c = byCheck({ ...at40, airflowCfm: 1200, supplyDryBulbF: 67 });
    expect(c.temperature_split).toMatchObject({ value: 8, status: 'ok' });
    expect(c.airflow_per_ton).toMatchObject({ value: 400, status: 'ok' });
    expect(c.sensible_capacity).toMatchObject({ value: 10368, status: 'ok' }); // 1.08 × 1200 × 8
    const asFull = byCheck({ ...at40, airflowCfm: 1200, supplyDryBulbF: 67, compressorType: 'fixed_speed', compressorHz: undefined, maxCompressorHz: undefined });
    expect(asFull.temperature_split!.status).toBe('alert');
    expect(asFull.sensible_capacity!.status).toBe('alert');
  });

  it('with no percent and no test mode, holds every capacity-bound verdict', () => {
    const c = byCheck({ ...at40, compressorHz: undefined });
    for (const id of ['superheat', 'subcooling', 'airflow_per_ton', 'temperature_split', 'sensible_capacity']) {
      expect(c[id]!.expected, id).toEqual({});
      expect(c[id]!.status, id).toBe('watch');
    }
  });
});

describe('a variable-speed unit forced to 100 %', () => {
  const forced: VisitReadings = {
    ...unit,
    compressorHz: 90,
    fullCapacityTest: true,
    supplyDryBulbF: 55,
    suctionPressurePsig: suction,
    suctionLineTempF: 55,
    liquidPressurePsig: liquid,
    liquidLineTempF: 95,
    airflowCfm: 1200,
  };

  it('judges the charge and the full-capacity bands', () => {
    const c = byCheck(forced);
    // EEV default 8–12 °F (common practice); subcooling target 10 ± 3 °F (nameplate, common practice).
    expect(c.superheat).toMatchObject({ value: 10, status: 'ok', expected: { min: 8, max: 12 } });
    expect(c.subcooling).toMatchObject({ value: 10, status: 'ok', expected: { min: 7, max: 13, target: 10 } });
    // 350–450 CFM/ton (common practice); split 19.9 ± 3 °F (Title 24 RA3.2, from memory); 1.08 × 1200 × 20 = 25,920 Btu/h.
    expect(c.airflow_per_ton).toMatchObject({ value: 400, status: 'ok', expected: { min: 350, max: 450 } });
    expect(c.temperature_split).toMatchObject({ value: 20, status: 'ok', expected: { min: 16.9, max: 22.9 } });
    expect(c.sensible_capacity).toMatchObject({ value: 25920, status: 'ok', expected: { min: 21600, max: 36000 } });
  });

  it('finds a low charge it could not judge at 40 %', () => {
    const c = byCheck({ ...forced, liquidLineTempF: 99 });
    expect(c.subcooling).toMatchObject({ value: 6, status: 'alert' }); // 10 ± 3 °F target
  });
});
