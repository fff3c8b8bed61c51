import { describe, expect, it } from 'vitest';
import {
  atmosphericPressurePsia,
  evaluateReadings,
  saturationPressurePsig,
  saturationTemperatureF,
  sensibleCapacityBtuh,
  sensibleHeatFactor,
  standardCfm,
  superheatF,
  tableGaugePsig,
} from '../../shared/hvac';

describe('altitude', () => {
  it('uses the ASHRAE standard atmosphere: 12.23 psia at 5000 ft', () => {
    // ASHRAE Handbook Fundamentals ch. 1, Table 1 standard atmosphere: 5000 ft → 12.231 psia.
    expect(atmosphericPressurePsia(5000)).toBeCloseTo(12.231, 2);
  });

  it('scales 1.08 with air density for actual CFM, and leaves standard CFM alone', () => {
    // 1.08 × 12.231 / 14.696 = 0.899 (1.08 is 60 × 0.075 lb/ft³ × 0.24; density ∝ pressure, ideal gas).
    expect(sensibleHeatFactor({ altitudeFt: 5000, airflowBasis: 'actual' })).toBeCloseTo(0.899, 3);
    expect(sensibleHeatFactor({ altitudeFt: 5000, airflowBasis: 'standard' })).toBe(1.08);
    expect(sensibleHeatFactor({ altitudeFt: 5000 })).toBe(1.08);
    // 1.08 × (12.231 / 14.696) × 1200 × 20 ≈ 21,570 Btu/h.
    expect(Math.abs(sensibleCapacityBtuh({ airflowCfm: 1200, temperatureSplitF: 20, altitudeFt: 5000, airflowBasis: 'actual' }) - 21570)).toBeLessThan(15);
    expect(standardCfm({ airflowCfm: 1200, altitudeFt: 5000, airflowBasis: 'actual' })).toBeCloseTo(998.7, 0); // 1200 × 12.231/14.696
  });

  it('restates gauge pressure against sea level before reading the table', () => {
    // absolute = gauge + local atmosphere; the table's gauge is against 14.696 psia (data/README.md).
    expect(tableGaugePsig(127.2, 5000)).toBeCloseTo(127.2 + 12.231 - 14.696, 2);
    expect(tableGaugePsig(127.2)).toBe(127.2);
    // The same absolute suction pressure reads 2.47 psi higher on a gauge at 5000 ft; the superheat must not change.
    const seaLevel = saturationPressurePsig('R-410A', 45, 'dew');
    const gaugeAt5000 = seaLevel + 14.696 - atmosphericPressurePsia(5000);
    expect(superheatF({ refrigerant: 'R-410A', suctionPressurePsig: gaugeAt5000, suctionLineTempF: 55, altitudeFt: 5000 })).toBeCloseTo(10, 6);
    // Ignoring the elevation would read the saturation about 0.8 °F high.
    expect(saturationTemperatureF('R-410A', gaugeAt5000, 'dew') - 45).toBeGreaterThan(0.5);
  });

  it('says in the capacity and airflow checks which CFM was meant', () => {
    const base = { returnDryBulbF: 75, supplyDryBulbF: 55, indoorWetBulbF: 61, nominalTons: 3, airflowCfm: 1200, altitudeFt: 5000 };
    const actual = evaluateReadings({ ...base, airflowBasis: 'actual' });
    const standard = evaluateReadings({ ...base, airflowBasis: 'standard' });
    const cap = (cs: typeof actual) => cs.find((c) => c.check === 'sensible_capacity')!;
    const flow = (cs: typeof actual) => cs.find((c) => c.check === 'airflow_per_ton')!;
    expect(cap(standard).value).toBe(25920); // 1.08 × 1200 × 20 (ASHRAE standard air)
    expect(Math.abs(cap(actual).value - 21570)).toBeLessThan(15); // 1.08 × (12.231 / 14.696) × 1200 × 20
    expect(cap(actual).source).toMatch(/air density at 5,000 ft/);
    expect(flow(standard).value).toBe(400);
    expect(flow(actual).value).toBe(333); // 998.7 standard CFM ÷ 3 tons
    expect(flow(actual).source).toMatch(/restated as standard CFM/);
  });
});
