import { describe, expect, it } from 'vitest';
import { isIsoDate, isoDate, isoInstant } from '../shared/schemas/dates';

describe('isIsoDate', () => {
  it('takes real calendar days only', () => {
    expect(isIsoDate('2026-03-02')).toBe(true);
    expect(isIsoDate('2026-02-30')).toBe(false);
    expect(isIsoDate('2026-04-31')).toBe(false);
    expect(isIsoDate('2026-13-01')).toBe(false);
    expect(isIsoDate('2026-00-10')).toBe(false);
    expect(isIsoDate('2026-01-00')).toBe(false);
    expect(isIsoDate('2026-1-5')).toBe(false);
    expect(isIsoDate('2026-01-05T00:00:00Z')).toBe(false);
  });

  it('follows the Gregorian leap rule (ISO 8601)', () => {
    expect(isIsoDate('2028-02-29')).toBe(true); // every 4th year
    expect(isIsoDate('2100-02-29')).toBe(false); // not a century
    expect(isIsoDate('2000-02-29')).toBe(true); // unless divisible by 400
    expect(isIsoDate('2027-02-29')).toBe(false);
  });
});

describe('the strict date and instant schemas', () => {
  it('refuse impossible and out-of-bounds dates', () => {
    expect(isoDate().safeParse('2026-02-30').success).toBe(false);
    expect(isoDate().safeParse('9999-12-31').success).toBe(false);
    expect(isoDate().safeParse('0001-01-01').success).toBe(false);
    expect(isoDate().safeParse('2026-02-28').success).toBe(true);
    expect(isoDate().safeParse(20260228).success).toBe(false);
  });

  it('refuse impossible and out-of-bounds instants', () => {
    expect(isoInstant().safeParse('2026-02-30T10:00:00Z').success).toBe(false);
    expect(isoInstant().safeParse('9999-12-30T15:00:00.000Z').success).toBe(false);
    expect(isoInstant().safeParse('2026-03-02T10:00:00-06:00').success).toBe(true);
    expect(isoInstant().safeParse('2026-03-02T10:00:00').success).toBe(false); // no offset
  });
});
