import { DateTime, IANAZone } from 'luxon';
import { timeRangeLabel } from '../visits';

const MINUTE = 60_000;
const HOUR = 60 * MINUTE;

export interface LocalDate {
  year: number;
  month: number;
  day: number;
}

/**
 * Every instant (epoch ms) at which the local clock in `zone` reads `minutes` after midnight on `date`.
 * Two in the repeated hour when clocks fall back, none in the skipped hour when they spring forward.
 */
export function wallClockOccurrences(zone: IANAZone, date: LocalDate, minutes: number): number[] {
  const asUtc = Date.UTC(date.year, date.month - 1, date.day) + minutes * MINUTE;
  const offsets = new Set([zone.offset(asUtc - 14 * HOUR), zone.offset(asUtc), zone.offset(asUtc + 14 * HOUR)]);
  const found = new Set<number>();
  for (const offset of offsets) {
    const instant = asUtc - offset * MINUTE;
    if (zone.offset(instant) === offset) found.add(instant);
  }
  return [...found].sort((a, b) => a - b);
}

/** The instant the clocks jumped over a skipped local time (the first moment after the gap). */
function gapEnd(zone: IANAZone, date: LocalDate, minutes: number): number {
  const asUtc = Date.UTC(date.year, date.month - 1, date.day) + minutes * MINUTE;
  let lo = asUtc - 14 * HOUR;
  let hi = asUtc + 14 * HOUR;
  const before = zone.offset(lo);
  // Bisect to the minute where the offset changes.
  while (hi - lo > MINUTE) {
    const mid = lo + Math.floor((hi - lo) / 2 / MINUTE) * MINUTE;
    if (zone.offset(mid) === before) lo = mid;
    else hi = mid;
  }
  return hi;
}

/**
 * Instants a local clock time stands for, as boundaries: a skipped time maps to the end of the gap,
 * a repeated time to both occurrences.
 */
export function boundaryInstants(zone: IANAZone, date: LocalDate, minutes: number): number[] {
  const found = wallClockOccurrences(zone, date, minutes);
  return found.length > 0 ? found : [gapEnd(zone, date, minutes)];
}

/** Opening uses the first time the clock shows the hour; closing the last. */
export function openingInstant(zone: IANAZone, date: LocalDate, minutes: number): number {
  return boundaryInstants(zone, date, minutes)[0]!;
}
export function closingInstant(zone: IANAZone, date: LocalDate, minutes: number): number {
  const all = boundaryInstants(zone, date, minutes);
  return all[all.length - 1]!;
}

// A zone's rules do not change while the process runs, so the answers are kept across searches,
// per zone; each asks the platform's time-zone data several times, which dominates a search.
const MAX_REMEMBERED = 20_000;
const boundaryCache = new Map<string, Map<string, readonly number[]>>();
const offsetCache = new Map<string, Map<number, number>>();

function cacheFor<K, V>(caches: Map<string, Map<K, V>>, zone: string): Map<K, V> {
  let c = caches.get(zone);
  if (!c) caches.set(zone, (c = new Map()));
  else if (c.size >= MAX_REMEMBERED) c.clear();
  return c;
}

/** Same answers as the functions above, remembered per zone, local date and clock time. */
export class WallClock {
  private readonly cache: Map<string, readonly number[]>;
  private readonly offsets: Map<number, number>;
  constructor(readonly zone: IANAZone) {
    this.cache = cacheFor(boundaryCache, zone.name);
    this.offsets = cacheFor(offsetCache, zone.name);
  }

  /** The instants, in order; shared between callers, so never changed. */
  boundaries(date: LocalDate, minutes: number): readonly number[] {
    const key = `${date.year}-${date.month}-${date.day}|${minutes}`;
    let hit = this.cache.get(key);
    if (!hit) {
      hit = boundaryInstants(this.zone, date, minutes);
      this.cache.set(key, hit);
    }
    return hit;
  }
  /** The zone's UTC offset in minutes at an instant. */
  offset(ms: number): number {
    let hit = this.offsets.get(ms);
    if (hit === undefined) {
      hit = this.zone.offset(ms);
      this.offsets.set(ms, hit);
    }
    return hit;
  }
  opening(date: LocalDate, minutes: number): number {
    return this.boundaries(date, minutes)[0]!;
  }
  closing(date: LocalDate, minutes: number): number {
    const all = this.boundaries(date, minutes);
    return all[all.length - 1]!;
  }
}

/** Whether the UTC offset changes at any point of this local date. */
export function clocksChangeOn(zone: IANAZone, date: LocalDate): boolean {
  const start = openingInstant(zone, date, 0);
  const end = closingInstant(zone, date, 1440);
  return zone.offset(start) !== zone.offset(end - 1);
}

function clockPart(dt: DateTime): { text: string; meridiem: 'am' | 'pm' } {
  const hour12 = dt.hour % 12 === 0 ? 12 : dt.hour % 12;
  const text = dt.minute === 0 ? String(hour12) : `${hour12}:${String(dt.minute).padStart(2, '0')}`;
  return { text, meridiem: dt.hour < 12 ? 'am' : 'pm' };
}

/** "Tue 14 Jul, 8–10 am"; "Sun 1 Nov, 1 am CDT–1 am CST" when the offset matters. */
export function windowLabel(startMs: number, endMs: number, timeZone: string, showZone: boolean): string {
  const start = DateTime.fromMillis(startMs, { zone: timeZone, locale: 'en-GB' });
  const end = DateTime.fromMillis(endMs, { zone: timeZone, locale: 'en-GB' });
  const day = start.toFormat('ccc d LLL');
  const a = clockPart(start);
  const b = clockPart(end);
  if (showZone) {
    const za = start.setLocale('en-US').offsetNameShort ?? start.toFormat('ZZ');
    const zb = end.setLocale('en-US').offsetNameShort ?? end.toFormat('ZZ');
    if (za === zb && a.meridiem === b.meridiem) return `${day}, ${a.text}–${b.text} ${b.meridiem} ${zb}`;
    return `${day}, ${a.text} ${a.meridiem} ${za}–${b.text} ${b.meridiem} ${zb}`;
  }
  return `${day}, ${timeRangeLabel(startMs, endMs, timeZone)}`;
}

export function toIso(ms: number, timeZone: string): string {
  return DateTime.fromMillis(ms, { zone: timeZone }).toISO({ suppressMilliseconds: true })!;
}
