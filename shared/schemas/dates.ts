import * as z from 'zod';

// One strict date and one strict instant for every request schema. A date is a real calendar day
// written YYYY-MM-DD (ISO 8601 calendar date); an instant is an ISO 8601 date-time with offset.

/** No date anyone here types is outside these years; a date outside them is a typo or a probe. */
export const EARLIEST_DATE = '1900-01-01';
export const LATEST_DATE = '2199-12-31';

// Gregorian leap rule: every 4th year, except centuries, except every 400th (ISO 8601).
const isLeap = (y: number) => (y % 4 === 0 && y % 100 !== 0) || y % 400 === 0;
const DAYS_IN_MONTH = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

/** True for a real calendar day "YYYY-MM-DD": no 30 February, no month 13, no day 00. */
export function isIsoDate(value: string): boolean {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(value);
  if (!m) return false;
  const [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])];
  if (mo < 1 || mo > 12 || d < 1) return false;
  return d <= (mo === 2 && isLeap(y) ? 29 : DAYS_IN_MONTH[mo - 1]!);
}

export const withinDateBounds = (isoDate: string) => isoDate >= EARLIEST_DATE && isoDate <= LATEST_DATE;

/** A strict, bounded calendar date. Both messages can be worded for the form using it. */
export function isoDate(message = 'must be a real date "YYYY-MM-DD"', boundsMessage = `must be between ${EARLIEST_DATE.slice(0, 4)} and ${LATEST_DATE.slice(0, 4)}`) {
  return z.string({ error: message }).refine(isIsoDate, { message, abort: true }).refine(withinDateBounds, boundsMessage);
}

/** A strict ISO date-time with offset whose calendar day is real and within the bounds. */
export function isoInstant(message = 'must be an ISO date-time with offset', boundsMessage = `must be between ${EARLIEST_DATE.slice(0, 4)} and ${LATEST_DATE.slice(0, 4)}`) {
  return z.iso.datetime({ offset: true, message }).refine((s) => {
    const t = Date.parse(s);
    return Number.isFinite(t) && withinDateBounds(new Date(t).toISOString().slice(0, 10));
  }, boundsMessage);
}
