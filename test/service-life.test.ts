import { describe, expect, it } from 'vitest';
import { EQUIPMENT_KINDS } from '../shared/equipment';
import {
  FILTER_CATEGORIES,
  FILTER_CATEGORY_LABELS,
  SERVICE_LIFE,
  ageText,
  assessServiceLife,
  equipmentAge,
  filterCategory,
  filterDimensionsIn,
  filterIntervalDays,
  warrantyStatus,
} from '../shared/service-life';

describe('typical service lives', () => {
  it('has a figure and a named source for every kind of equipment', () => {
    for (const kind of EQUIPMENT_KINDS) {
      const life = SERVICE_LIFE[kind];
      expect(life.years, kind).toBeGreaterThan(0);
      expect(life.source, kind).toMatch(/ASHRAE|NAHB|Common practice/);
      expect(life.source, kind).not.toMatch(/ASHRAE[^;]*from memory/);
    }
  });

  it('matches the handbook medians for split air conditioners, heat pumps and furnaces', () => {
    // ASHRAE Handbook—HVAC Applications, Owning and Operating Costs, Comparison of Service Life Estimates (median years).
    expect(SERVICE_LIFE.condensing_unit.years).toBe(15);
    expect(SERVICE_LIFE.heat_pump.years).toBe(15);
    expect(SERVICE_LIFE.gas_furnace.years).toBe(18);
  });

  it('gives geothermal heat pumps the median life, not the "up to" figure', () => {
    // ASHRAE HVAC Applications, Comparison of Service Life Estimates: water-to-air heat pump median 19 years
    // (the DOE's "up to 24 years" for indoor parts is a best case, not a median).
    expect(SERVICE_LIFE.geothermal_heat_pump.years).toBe(19);
    expect(SERVICE_LIFE.geothermal_heat_pump.source).toMatch(/median/);
  });

  it('checks the other figures against the handbook and the NAHB study', () => {
    // ASHRAE HVAC Applications, Comparison of Service Life Estimates: electronic controls 15, fan-coil units 20.
    expect(SERVICE_LIFE.thermostat.years).toBe(15);
    expect(SERVICE_LIFE.air_handler.years).toBe(20);
    // NAHB Study of Life Expectancy of Home Components (2007): humidifiers 8 years (from memory).
    expect(SERVICE_LIFE.humidifier.years).toBe(8);
    for (const kind of ['condensing_unit', 'heat_pump', 'gas_furnace'] as const) expect(SERVICE_LIFE[kind].secondReference, kind).toMatch(/NAHB/);
  });
});

describe('equipment age', () => {
  it('counts whole years and months like a birthday', () => {
    expect(equipmentAge('2014-06-15', '2026-06-14')).toMatchObject({ years: 11, months: 11 });
    expect(equipmentAge('2014-06-15', '2026-06-15')).toMatchObject({ years: 12, months: 0 });
    expect(equipmentAge('2026-05-31', '2026-06-01')).toMatchObject({ years: 0, months: 0 });
  });

  it('lets a leap-day install turn a year older on 28 February', () => {
    // Common practice for anniversaries of 29 Feb in non-leap years (end-of-month rule).
    expect(equipmentAge('2024-02-29', '2025-02-28')).toMatchObject({ years: 1, months: 0 });
    expect(equipmentAge('2024-02-29', '2025-02-27')).toMatchObject({ years: 0, months: 11 });
  });

  it('agrees with Date arithmetic on whole months for a spread of dates', () => {
    // Oracle: month difference computed independently through the JavaScript Date object.
    for (const [from, to] of [
      ['2003-01-31', '2026-03-30'],
      ['2010-12-01', '2026-11-30'],
      ['1999-07-04', '2026-07-04'],
    ] as const) {
      const a = new Date(`${from}T00:00:00Z`);
      const b = new Date(`${to}T00:00:00Z`);
      let months = (b.getUTCFullYear() - a.getUTCFullYear()) * 12 + b.getUTCMonth() - a.getUTCMonth();
      const lastDay = new Date(Date.UTC(b.getUTCFullYear(), b.getUTCMonth() + 1, 0)).getUTCDate();
      if (b.getUTCDate() < Math.min(a.getUTCDate(), lastDay)) months--;
      const age = equipmentAge(from, to);
      expect(age.years * 12 + age.months).toBe(months);
    }
  });

  it('refuses an install date after today, or a date that does not exist, naming the field', () => {
    expect(() => equipmentAge('2027-01-01', '2026-06-01')).toThrow(/installedOn/);
    expect(() => equipmentAge('2023-02-29', '2026-06-01')).toThrow(/installedOn/);
    expect(() => equipmentAge('2020-01-01', 'soon')).toThrow(/today/);
  });

  it('words the age for people', () => {
    expect(ageText({ years: 1, months: 0, exact: 1 })).toBe('1 year');
    expect(ageText({ years: 12, months: 3, exact: 12.25 })).toBe('12 years, 3 months');
    expect(ageText({ years: 0, months: 0, exact: 0 })).toBe('Less than a month');
  });
});

describe('nearing end of service life', () => {
  it('flags a 15-year condenser from 12 years (80 %) and past at 15', () => {
    expect(assessServiceLife('condensing_unit', '2014-07-01', '2026-06-30').status).toBe('ok');
    expect(assessServiceLife('condensing_unit', '2014-07-01', '2026-07-01').status).toBe('nearing');
    expect(assessServiceLife('condensing_unit', '2011-07-01', '2026-07-01').status).toBe('past');
    expect(assessServiceLife('condensing_unit', '2011-07-01', '2026-07-01').yearsLeft).toBe(0);
  });

  it('says unknown without an install date rather than guessing', () => {
    const a = assessServiceLife('gas_furnace', null, '2026-07-01');
    expect(a.status).toBe('unknown');
    expect(a.typicalYears).toBe(18);
  });
});

describe('warranty', () => {
  it('is active, ending within 90 days, or ended', () => {
    expect(warrantyStatus(null, '2026-06-01')).toBe('unknown');
    expect(warrantyStatus('2026-12-01', '2026-06-01')).toBe('active');
    expect(warrantyStatus('2026-08-30', '2026-06-01')).toBe('ending_soon');
    expect(warrantyStatus('2026-06-01', '2026-06-01')).toBe('ending_soon');
    expect(warrantyStatus('2026-05-31', '2026-06-01')).toBe('expired');
  });
});

describe('filter change intervals', () => {
  it('go by filter type', () => {
    // 1-inch fiberglass monthly (common practice, filter packaging); 1-inch pleated every 3 months (ENERGY STAR
    // maintenance checklist); 2-inch about every 3 months; 4–5-inch media every 6–12 months (common practice).
    expect(filterIntervalDays(filterCategory('16x25x1', 'Fiberglass'))).toBe(30);
    expect(filterIntervalDays(filterCategory('16x25x1', 'Pleated MERV 8'))).toBe(90);
    expect(filterIntervalDays(filterCategory('16x25x1'))).toBe(90);
    expect(filterIntervalDays(filterCategory('16x25x2'))).toBe(90);
    expect(filterIntervalDays(filterCategory('20x25x4'))).toBe(180);
    expect(filterIntervalDays(filterCategory('20x25x5'))).toBe(180);
    expect(filterCategory('', 'Media cabinet')).toBe('media_4_5_inch');
    expect(FILTER_CATEGORIES.map((c) => FILTER_CATEGORY_LABELS[c])).toEqual(['1-inch fiberglass', '1-inch pleated', '2-inch', '4–5-inch media']);
  });

  it('read sizes written with units and actual depths', () => {
    expect(filterDimensionsIn('16x25x4 in')).toEqual({ width: 16, height: 25, depth: 4 });
    expect(filterDimensionsIn('16 x 25 x 4 inches')).toEqual({ width: 16, height: 25, depth: 4 });
    expect(filterDimensionsIn('20X25X4.5"')).toEqual({ width: 20, height: 25, depth: 4.5 });
    expect(filterDimensionsIn('16x25')).toBeNull();
    expect(filterCategory('16x25x4 in')).toBe('media_4_5_inch');
    // Actual depths: a nominal 1-inch filter is about 3/4 inch, a 4-inch media filter about 3 5/8 inches (common practice).
    expect(filterCategory('15.75x24.75x0.75')).toBe('one_inch_pleated');
    expect(filterCategory('19.75x24.75x3.625')).toBe('media_4_5_inch');
  });
});
