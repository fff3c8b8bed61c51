import { DateTime } from 'luxon';
import { BOARD_RANGE_YEARS, BOOKING_HORIZON_MONTHS } from '../../shared/schemas/booking';
import { AppError } from './errors';

// Relative bounds on dates a request names. The schemas already refuse impossible and absurd
// dates; these need the clock, so the routes apply them after parsing, before any service runs.

interface Range {
  /** How far back from today, in days. */
  before: { days?: number; years?: number };
  /** How far ahead of today. */
  after: { months?: number; years?: number };
  /** Says what the range is, for the message. */
  describe: string;
}

/** Booking opens today (the day before, for time-zone slack) and at most the horizon ahead. */
export const BOOKING_RANGE: Range = { before: { days: 1 }, after: { months: BOOKING_HORIZON_MONTHS }, describe: `Booking opens at most ${BOOKING_HORIZON_MONTHS} months ahead.` };

/** The dispatch board, schedules, time off and assignments look at most this far either way. */
export const OFFICE_RANGE: Range = {
  before: { years: BOARD_RANGE_YEARS },
  after: { years: BOARD_RANGE_YEARS },
  describe: `Choose a date within ${BOARD_RANGE_YEARS} years of today.`,
};

/** "windowStart" → "Window start": a field's name as a person reads it. */
function labelOf(name: string): string {
  const words = name.replace(/([a-z])([A-Z])/g, '$1 $2').toLowerCase();
  return words.charAt(0).toUpperCase() + words.slice(1);
}

/**
 * Throws a 422 naming each field whose date (YYYY-MM-DD, or the UTC day of an ISO instant) is
 * outside the range around `now`, each message starting with the field's label. Absent fields pass.
 */
export function assertDatesWithin(now: Date, range: Range, values: Record<string, string | null | undefined>, labels: Record<string, string> = {}): void {
  const today = DateTime.fromJSDate(now, { zone: 'utc' }).startOf('day');
  const earliest = today.minus(range.before).toISODate()!;
  const latest = today.plus(range.after).plus({ days: 1 }).toISODate()!;
  const fields: Record<string, string> = {};
  for (const [name, value] of Object.entries(values)) {
    if (!value) continue;
    const day = value.length === 10 ? value : new Date(value).toISOString().slice(0, 10);
    if (day < earliest || day > latest) fields[name] = `${labels[name] ?? labelOf(name)}: ${range.describe}`;
  }
  const names = Object.keys(fields);
  if (names.length) throw new AppError(422, 'validation_failed', `Please check ${names.map((n) => labels[n] ?? labelOf(n)).join(', ')}.`, fields);
}
