import { describe, expect, it } from 'vitest';
import { cautions, evaluateReadings, homeownerWording, type ReadingCheck, type VisitReadings } from '../../shared/hvac';

const only = (r: VisitReadings, check: string): ReadingCheck => {
  const found = evaluateReadings(r).filter((c) => c.check === check);
  expect(found).toHaveLength(1);
  return found[0]!;
};

describe('total external static pressure', () => {
  it('is judged against 0.5 in. w.c. when no nameplate figure is entered', () => {
    // 0.5 in. w.c. is the usual residential maximum (common practice); 0.1 above it is our watch band.
    expect(only({ totalExternalStaticInWc: 0.45 }, 'external_static_pressure')).toMatchObject({ status: 'ok', unit: 'in. w.c.', expected: { max: 0.5 } });
    expect(only({ totalExternalStaticInWc: 0.58 }, 'external_static_pressure').status).toBe('watch');
    const high = only({ totalExternalStaticInWc: 0.8 }, 'external_static_pressure');
    expect(high.status).toBe('alert');
    expect(high.source).toMatch(/0.5 in. w.c. is the usual residential maximum \(no nameplate figure entered\)/);
  });

  it('uses the nameplate or blower-table maximum when entered', () => {
    // Nameplate maximum external static, e.g. 0.8 in. w.c. on a high-static blower (as entered).
    const c = only({ totalExternalStaticInWc: 0.7, maxExternalStaticInWc: 0.8 }, 'external_static_pressure');
    expect(c).toMatchObject({ status: 'ok', expected: { max: 0.8 } });
    expect(c.source).toMatch(/Nameplate or blower-table/);
  });
});

describe('carbon monoxide', () => {
  it('flue CO air-free: over 100 ppm needs service, over 400 ppm is hazardous', () => {
    // ANSI Z21.47/CSA 2.3: at most 400 ppm air-free in a furnace's flue products; 100 ppm service level (BPI-1200, from memory).
    expect(only({ flueCoAirFreePpm: 35 }, 'co_flue_air_free')).toMatchObject({ status: 'ok', unit: 'ppm', expected: { max: 100 } });
    expect(only({ flueCoAirFreePpm: 250 }, 'co_flue_air_free').status).toBe('watch');
    expect(only({ flueCoAirFreePpm: 400 }, 'co_flue_air_free').status).toBe('watch');
    const bad = only({ flueCoAirFreePpm: 650 }, 'co_flue_air_free');
    expect(bad.status).toBe('alert');
    expect(bad.source).toMatch(/ANSI Z21.47/);
    expect(bad.message).toMatch(/hazardous, stop and make the appliance safe/);
    expect(bad.caution).toBe('co_hazard');
    expect(only({ flueCoAirFreePpm: 250 }, 'co_flue_air_free').caution).toBeUndefined();
  });

  it('living-space CO: above 9 ppm find the source, above 35 ppm hazardous', () => {
    // U.S. EPA national ambient air quality standard for CO: 9 ppm over 8 hours, 35 ppm over 1 hour.
    expect(only({ ambientCoPpm: 0 }, 'co_ambient').status).toBe('ok');
    expect(only({ ambientCoPpm: 9 }, 'co_ambient').status).toBe('ok');
    expect(only({ ambientCoPpm: 15 }, 'co_ambient').status).toBe('watch');
    const bad = only({ ambientCoPpm: 50 }, 'co_ambient');
    expect(bad).toMatchObject({ status: 'alert', caution: 'co_hazard' });
    expect(bad.source).toMatch(/EPA/);
  });

  it('the hazard caution says to stop and make the appliance safe, deferring to local codes', () => {
    const c = cautions.find((x) => x.id === 'co_hazard')!;
    expect(c.text).toMatch(/^Stop\. Shut the appliance off and make it safe/);
    expect(c.text).toMatch(/local codes and licensed practice/);
    expect(c.audience).toEqual(['technician']);
  });

  it('words the readings for the homeowner without shorthand', () => {
    for (const c of evaluateReadings({ flueCoAirFreePpm: 650, ambientCoPpm: 3, totalExternalStaticInWc: 0.9 })) {
      expect(homeownerWording(c)).not.toMatch(/ppm|w\.c\.|air-free|static/i);
    }
  });
});
