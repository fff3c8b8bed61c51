import { describe, expect, it } from 'vitest';
import { availableWindows, planBooking, wallClockOccurrences, type AvailabilityInput, type WeeklyHours } from '../shared/scheduling';
import { IANAZone } from 'luxon';

// The expected clock changes come from the IANA tz database as shipped in ICU (Intl), not from luxon:
// America/Chicago 2026-03-08 02:00 CST → 03:00 CDT and 2026-11-01 02:00 CDT → 01:00 CST (US rule since 2007).
const TZ = 'America/Chicago';
const HOUR = 3_600_000;

const intl = new Intl.DateTimeFormat('en-US', {
  timeZone: TZ,
  hourCycle: 'h23',
  year: 'numeric',
  month: '2-digit',
  day: '2-digit',
  hour: '2-digit',
  minute: '2-digit',
  timeZoneName: 'shortOffset',
});
const intlShort = new Intl.DateTimeFormat('en-US', { timeZone: TZ, timeZoneName: 'short' });

/** Local date, clock and offset of an instant according to Intl. */
function local(iso: string | number): { date: string; clock: string; offset: string } {
  const parts = Object.fromEntries(intl.formatToParts(new Date(iso)).map((p) => [p.type, p.value]));
  return { date: `${parts.year}-${parts.month}-${parts.day}`, clock: `${parts.hour}:${parts.minute}`, offset: parts.timeZoneName! };
}
const abbreviation = (iso: string) => intlShort.formatToParts(new Date(iso)).find((p) => p.type === 'timeZoneName')!.value;

function nightInput(date: string, hours: WeeklyHours['sun'], windowMinutes: number): AvailabilityInput {
  return {
    settings: {
      timeZone: TZ,
      // Night on-call hours on a Sunday, so the windows straddle the 2 am change.
      businessHours: { sun: hours },
      visitMinutes: { no_heat: 30 },
      travelBufferMinutes: 0,
      leadTimeMinutes: 0,
      heldBackShare: 0.25,
      windowMinutes,
    },
    technicians: [{ id: 'ana', weeklyHours: { sun: [{ open: '00:00', close: '24:00' }] } }],
    booked: [],
    request: { visitKind: 'no_heat', urgent: true, from: date, to: date, now: '2026-01-01T00:00:00Z' },
  };
}

function expectContiguous(ws: Array<{ start: string; end: string }>): void {
  for (let i = 1; i < ws.length; i++) expect(Date.parse(ws[i]!.start)).toBe(Date.parse(ws[i - 1]!.end));
}

describe('the calendar itself, per Intl', () => {
  it('Chicago springs forward on 2026-03-08 and falls back on 2026-11-01', () => {
    expect(local('2026-03-08T07:59:00Z')).toMatchObject({ clock: '01:59', offset: 'GMT-6' });
    expect(local('2026-03-08T08:00:00Z')).toMatchObject({ clock: '03:00', offset: 'GMT-5' });
    expect(local('2026-11-01T06:59:00Z')).toMatchObject({ clock: '01:59', offset: 'GMT-5' });
    expect(local('2026-11-01T07:00:00Z')).toMatchObject({ clock: '01:00', offset: 'GMT-6' });
  });

  it('wall-clock resolution matches Intl for every quarter hour of both change days', () => {
    const zone = IANAZone.create(TZ);
    for (const [date, y, m, d] of [
      ['2026-03-08', 2026, 3, 8],
      ['2026-11-01', 2026, 11, 1],
    ] as const) {
      // Every instant Intl shows on that local date, grouped by the clock it shows.
      const byClock = new Map<string, number[]>();
      for (let t = Date.parse(`${date}T00:00:00Z`); t < Date.parse(`${date}T00:00:00Z`) + 36 * HOUR; t += HOUR / 4) {
        const l = local(t);
        if (l.date !== date) continue;
        byClock.set(l.clock, [...(byClock.get(l.clock) ?? []), t]);
      }
      for (let minutes = 0; minutes < 1440; minutes += 15) {
        const clock = `${String(Math.floor(minutes / 60)).padStart(2, '0')}:${String(minutes % 60).padStart(2, '0')}`;
        expect(wallClockOccurrences(zone, { year: y, month: m, day: d }, minutes), `${date} ${clock}`).toEqual(byClock.get(clock) ?? []);
      }
    }
  });
});

describe('spring forward, Sun 8 Mar 2026', () => {
  it('no window starts in the hour that does not exist, and none is lost', () => {
    const ws = availableWindows(nightInput('2026-03-08', [{ open: '00:00', close: '06:00' }], 60));
    expect(ws.map((w) => `${local(w.start).clock} ${local(w.start).offset}`)).toEqual(['00:00 GMT-6', '01:00 GMT-6', '03:00 GMT-5', '04:00 GMT-5', '05:00 GMT-5']);
    for (const w of ws) expect(local(w.start).clock.startsWith('02:')).toBe(false);
    expectContiguous(ws);
    // Six clock hours of business on a 23-hour day are five real hours.
    expect(Date.parse(ws.at(-1)!.end) - Date.parse(ws[0]!.start)).toBe(5 * HOUR);
    expect(ws[1]!.localLabel).toBe(`Sun 8 Mar, 1 am ${abbreviation(ws[1]!.start)}–3 am ${abbreviation(ws[1]!.end)}`);
    expect(ws[1]!.localLabel).toBe('Sun 8 Mar, 1 am CST–3 am CDT');
  });

  it('a two-hour grid whose 02:00 boundary does not exist starts the next window at 03:00', () => {
    const ws = availableWindows(nightInput('2026-03-08', [{ open: '00:00', close: '06:00' }], 120));
    expect(ws.map((w) => [local(w.start).clock, local(w.end).clock])).toEqual([
      ['00:00', '03:00'],
      ['03:00', '04:00'],
      ['04:00', '06:00'],
    ]);
    expectContiguous(ws);
  });

  it('daytime windows that day carry the new offset', () => {
    const ws = availableWindows(nightInput('2026-03-08', [{ open: '08:00', close: '12:00' }], 120));
    expect(ws.map((w) => w.start)).toEqual(['2026-03-08T08:00:00-05:00', '2026-03-08T10:00:00-05:00']);
    for (const w of ws) expect(local(w.start).offset).toBe('GMT-5');
    // The day before is still standard time.
    const sat = availableWindows({
      ...nightInput('2026-03-07', [], 120),
      settings: { ...nightInput('2026-03-07', [], 120).settings, businessHours: { sat: [{ open: '08:00', close: '10:00' }] } },
      technicians: [{ id: 'ana', weeklyHours: { sat: [{ open: '08:00', close: '10:00' }] } }],
    });
    expect(sat.map((w) => [w.start, local(w.start).offset])).toEqual([['2026-03-07T08:00:00-06:00', 'GMT-6']]);
  });
});

describe('fall back, Sun 1 Nov 2026', () => {
  it('the repeated hour gets one window on each side, none doubled, none lost', () => {
    const ws = availableWindows(nightInput('2026-11-01', [{ open: '00:00', close: '06:00' }], 60));
    expect(ws.map((w) => `${local(w.start).clock} ${local(w.start).offset}`)).toEqual([
      '00:00 GMT-5',
      '01:00 GMT-5',
      '01:00 GMT-6',
      '02:00 GMT-6',
      '03:00 GMT-6',
      '04:00 GMT-6',
      '05:00 GMT-6',
    ]);
    const oneAm = ws.filter((w) => local(w.start).clock === '01:00');
    expect(oneAm.map((w) => local(w.start).offset)).toEqual(['GMT-5', 'GMT-6']);
    expect(new Set(ws.map((w) => Date.parse(w.start))).size).toBe(ws.length);
    expectContiguous(ws);
    // Six clock hours on a 25-hour day are seven real hours.
    expect(Date.parse(ws.at(-1)!.end) - Date.parse(ws[0]!.start)).toBe(7 * HOUR);
    expect(oneAm.map((w) => w.localLabel)).toEqual(['Sun 1 Nov, 1 am CDT–1 am CST', 'Sun 1 Nov, 1–2 am CST']);
    expect(abbreviation(oneAm[0]!.start)).toBe('CDT');
    expect(abbreviation(oneAm[1]!.start)).toBe('CST');
  });

  it('a two-hour window across the change covers the repeated hour exactly once', () => {
    const ws = availableWindows(nightInput('2026-11-01', [{ open: '00:00', close: '06:00' }], 120));
    expect(ws.map((w) => [w.start, w.end])).toEqual([
      ['2026-11-01T00:00:00-05:00', '2026-11-01T02:00:00-06:00'],
      ['2026-11-01T02:00:00-06:00', '2026-11-01T04:00:00-06:00'],
      ['2026-11-01T04:00:00-06:00', '2026-11-01T06:00:00-06:00'],
    ]);
    // Both occurrences of 01:30 fall inside the first window and nowhere else.
    for (const t of ['2026-11-01T06:30:00Z', '2026-11-01T07:30:00Z']) {
      expect(local(t).clock).toBe('01:30');
      expect(ws.filter((w) => Date.parse(w.start) <= Date.parse(t) && Date.parse(t) < Date.parse(w.end))).toHaveLength(1);
    }
  });

  it('a booking in the second 1 am window is planned on standard time', () => {
    const plan = planBooking(nightInput('2026-11-01', [{ open: '00:00', close: '06:00' }], 60), '2026-11-01T01:00:00-06:00');
    expect(plan).toMatchObject({ ok: true, visit: { start: '2026-11-01T01:00:00-06:00', end: '2026-11-01T01:30:00-06:00' } });
    if (plan.ok) expect(local(plan.visit.start)).toMatchObject({ clock: '01:00', offset: 'GMT-6' });
  });

  it('a shift that closes at 01:30 ends at the later 01:30', () => {
    const i = nightInput('2026-11-01', [{ open: '00:00', close: '06:00' }], 60);
    i.technicians = [{ id: 'ana', weeklyHours: { sun: [{ open: '00:00', close: '01:30' }] } }];
    const ws = availableWindows(i);
    // 30-minute visits can start until 01:00 CST (07:00Z) and still end by the second 01:30.
    expect(ws.map((w) => w.start)).toEqual(['2026-11-01T00:00:00-05:00', '2026-11-01T01:00:00-05:00', '2026-11-01T01:00:00-06:00']);
  });
});
