import { Pipe, inject, type PipeTransform } from '@angular/core';
import { formatTermDay } from '../../../shared/agreement-terms';
import { Session } from '../core/session';

// Every date on screen is written here, in the company's time zone and one style:
// "March 14, 2027", "Tuesday, March 14, 2027" with its weekday, "March 14, 2027, 9:00 AM" with a
// time. The day style is the one agreement terms, e-mails and receipts use (formatTermDay).
// No ISO dates on screen.

const CALENDAR_DAY = /^\d{4}-\d{2}-\d{2}$/;

/** ICU writes a narrow no-break space before AM/PM; screens and tests read a normal space. */
const plain = (s: string) => s.replace(/[\u202f\u00a0]/g, ' ');

/**
 * A day. A calendar date ("2027-03-14") is already a day where the company works and is written
 * as it is; an instant is written as the day it falls on in `timeZone`.
 */
export function dayLabel(value: string | Date, timeZone: string, opts: { weekday?: boolean } = {}): string {
  if (typeof value === 'string' && CALENDAR_DAY.test(value)) {
    if (!opts.weekday) return formatTermDay(value);
    return plain(new Intl.DateTimeFormat('en-US', { dateStyle: 'full', timeZone: 'UTC' }).format(new Date(`${value}T00:00:00Z`)));
  }
  const at = typeof value === 'string' ? new Date(value) : value;
  if (Number.isNaN(at.getTime())) return '';
  return plain(new Intl.DateTimeFormat('en-US', { dateStyle: opts.weekday ? 'full' : 'long', timeZone }).format(at));
}

/** "9:00 AM" in `timeZone`. */
export function timeLabel(value: string | Date, timeZone: string): string {
  const at = typeof value === 'string' ? new Date(value) : value;
  if (Number.isNaN(at.getTime())) return '';
  return plain(new Intl.DateTimeFormat('en-US', { hour: 'numeric', minute: '2-digit', timeZone }).format(at));
}

/** "March 14, 2027, 9:00 AM" in `timeZone`. */
export function dateTimeLabel(value: string | Date, timeZone: string): string {
  const day = dayLabel(value, timeZone);
  return day ? `${day}, ${timeLabel(value, timeZone)}` : '';
}

/** The ISO date of the day an instant falls on in `timeZone` (for grouping, never for display). */
export function localDay(value: string | Date, timeZone: string): string {
  const at = typeof value === 'string' ? new Date(value) : value;
  const parts = Object.fromEntries(
    new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).formatToParts(at).map((p) => [p.type, p.value]),
  );
  return `${parts['year']}-${parts['month']}-${parts['day']}`;
}

// Impure so that a page drawn before the session answered redraws in the company's zone; each
// keeps its last answer, so a check costs a comparison.
@Pipe({ name: 'swDay', pure: false })
export class DayPipe implements PipeTransform {
  private readonly session = inject(Session);
  private last: { key: string; out: string } | null = null;
  transform(value: string | Date | null | undefined, style: 'day' | 'weekday' = 'day'): string {
    if (value === null || value === undefined || value === '') return '';
    const zone = this.session.timeZone();
    const key = `${String(value instanceof Date ? value.toISOString() : value)}|${zone}|${style}`;
    if (this.last?.key !== key) this.last = { key, out: dayLabel(value, zone, { weekday: style === 'weekday' }) };
    return this.last.out;
  }
}

@Pipe({ name: 'swDateTime', pure: false })
export class DateTimePipe implements PipeTransform {
  private readonly session = inject(Session);
  private last: { key: string; out: string } | null = null;
  transform(value: string | Date | null | undefined, style: 'date-time' | 'time' = 'date-time'): string {
    if (value === null || value === undefined || value === '') return '';
    const zone = this.session.timeZone();
    const key = `${String(value instanceof Date ? value.toISOString() : value)}|${zone}|${style}`;
    if (this.last?.key !== key) this.last = { key, out: style === 'time' ? timeLabel(value, zone) : dateTimeLabel(value, zone) };
    return this.last.out;
  }
}

/** "Mon, Nov 30": the same style, shortened, for a column of days side by side. */
export function shortDayLabel(value: string, timeZone: string): string {
  const calendar = CALENDAR_DAY.test(value);
  const at = calendar ? new Date(`${value}T00:00:00Z`) : new Date(value);
  return plain(new Intl.DateTimeFormat('en-US', { weekday: 'short', month: 'short', day: 'numeric', timeZone: calendar ? 'UTC' : timeZone }).format(at));
}
