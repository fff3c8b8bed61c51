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
  return new Date(wallClock(at.getTime(), timeZone)).toISOString().slice(0, 10);
}

/**
 * An instant as a `datetime-local` value ("2027-03-14T09:05") in `timeZone`, `months` later when
 * asked (the day kept, or the month's last day when it is shorter): the bounds of a date-time field.
 */
export function dateTimeInputValue(at: Date, timeZone: string, { months = 0 } = {}): string {
  const wall = new Date(wallClock(at.getTime(), timeZone));
  const first = new Date(Date.UTC(wall.getUTCFullYear(), wall.getUTCMonth() + months, 1, wall.getUTCHours(), wall.getUTCMinutes()));
  const lastDay = new Date(Date.UTC(first.getUTCFullYear(), first.getUTCMonth() + 1, 0)).getUTCDate();
  first.setUTCDate(Math.min(wall.getUTCDate(), lastDay));
  return first.toISOString().slice(0, 16);
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

// Calendar arithmetic and wall-clock instants without a date library: calendar days are
// "YYYY-MM-DD" strings counted in UTC (no zone, so no daylight-saving change can shift them), and
// an instant is found from the zone's offset as Intl reports it.

const DAY_MS = 86_400_000;

function calendarTime(day: string): number {
  const t = CALENDAR_DAY.test(day) ? Date.parse(`${day}T00:00:00Z`) : Number.NaN;
  if (Number.isNaN(t)) throw new RangeError(`day: must be a date as YYYY-MM-DD, got ${String(day)}`);
  return t;
}

/** The calendar day `days` after `day` (before it when negative): addDays('2027-02-28', 1) is '2027-03-01'. */
export function addDays(day: string, days: number): string {
  return new Date(calendarTime(day) + Math.round(days) * DAY_MS).toISOString().slice(0, 10);
}

/** The Monday of the week `day` is in (weeks run Monday to Sunday, as ISO 8601 counts them). */
export function weekStart(day: string): string {
  const weekday = new Date(calendarTime(day)).getUTCDay();
  return addDays(day, -((weekday + 6) % 7));
}

const clockFormats = new Map<string, Intl.DateTimeFormat>();
/** What the clock in `timeZone` reads at instant `t`, to the second, written as if it were UTC (ms). */
function wallClock(t: number, timeZone: string): number {
  let f = clockFormats.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat('en-US', { timeZone, hourCycle: 'h23', year: 'numeric', month: 'numeric', day: 'numeric', hour: 'numeric', minute: 'numeric', second: 'numeric' });
    clockFormats.set(timeZone, f);
  }
  const p = Object.fromEntries(f.formatToParts(new Date(t)).map((x) => [x.type, Number(x.value)]));
  return Date.UTC(p['year']!, p['month']! - 1, p['day']!, p['hour']!, p['minute']!, p['second']!);
}

/** How far the clock in `timeZone` is ahead of UTC at instant `t`, in milliseconds. */
function offsetAt(t: number, timeZone: string): number {
  return wallClock(t, timeZone) - (t - (((t % 1000) + 1000) % 1000));
}

/**
 * The instant at which the clock in `timeZone` reads `time` ("09:30") on `day`. A time that a
 * change to daylight saving skips (2:30 AM on a spring-forward night) moves on by the gap, as the
 * clock does (3:30 AM); a time that occurs twice when the clocks go back is its first occurrence.
 */
export function zonedInstant(day: string, time: string, timeZone: string): Date {
  const m = /^([01]\d|2[0-3]):([0-5]\d)$/.exec(time);
  if (!m) throw new RangeError(`time: must be a time as HH:MM, got ${String(time)}`);
  const local = calendarTime(day) + (Number(m[1]) * 60 + Number(m[2])) * 60_000;
  // A zone changes its offset at most once in a day: the offsets a day either side are the candidates.
  const before = offsetAt(local - DAY_MS, timeZone);
  const after = offsetAt(local + DAY_MS, timeZone);
  const fits = [before, after].map((o) => local - o).filter((t) => offsetAt(t, timeZone) === local - t);
  if (fits.length) return new Date(Math.min(...fits));
  return new Date(local - before);
}
