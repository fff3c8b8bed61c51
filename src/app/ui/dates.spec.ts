import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { Component, signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { Session } from '../core/session';
import { DateTimePipe, DayPipe, addDays, dateTimeInputValue, dateTimeLabel, dayLabel, shortDayLabel, timeLabel, weekStart, zonedInstant } from './dates';
import { PhoneLink } from './phone-link';

describe('dates on screen', () => {
  it('writes an instant as the day and time it is where the company works, not where the browser is', () => {
    // 03:30 UTC on 2 Dec is still 1 Dec, 9:30 PM in Chicago (UTC−6 in December, IANA tz database).
    expect(dayLabel('2026-12-02T03:30:00Z', 'America/Chicago')).toBe('December 1, 2026');
    expect(dateTimeLabel('2026-12-02T03:30:00Z', 'America/Chicago')).toBe('December 1, 2026, 9:30 PM');
    expect(timeLabel('2026-12-02T03:30:00Z', 'America/Chicago')).toBe('9:30 PM');
  });

  it('writes a calendar day as that day in every zone, in the style of agreement terms', () => {
    expect(dayLabel('2027-03-14', 'Pacific/Auckland')).toBe('March 14, 2027');
    expect(dayLabel('2027-03-14', 'America/Chicago', { weekday: true })).toBe('Sunday, March 14, 2027');
    expect(shortDayLabel('2026-11-30', 'America/Chicago')).toBe('Mon, Nov 30');
  });

  it('pipes follow the company zone the session names, and a phone number is a tel: link in national format', async () => {
    @Component({
      imports: [DayPipe, DateTimePipe, PhoneLink],
      template: `<p id="d">{{ at() | swDay }}</p>
        <p id="t">{{ at() | swDateTime }}</p>
        <sw-phone-link [number]="'+18165550142'" prefix="Call " />`,
    })
    class Host {
      readonly at = signal('2026-12-02T03:30:00Z');
    }
    TestBed.configureTestingModule({ imports: [Host], providers: [provideHttpClient(), provideHttpClientTesting()] });
    const session = TestBed.inject(Session);
    const loading = session.load();
    TestBed.inject(HttpTestingController)
      .expectOne('/api/session')
      .flush({ user: null, company: { timeZone: 'America/Chicago', country: 'US' } });
    await loading;
    const fixture = TestBed.createComponent(Host);
    await fixture.whenStable();
    const el: HTMLElement = fixture.nativeElement;
    expect(el.querySelector('#d')?.textContent).toBe('December 1, 2026');
    expect(el.querySelector('#t')?.textContent).toBe('December 1, 2026, 9:30 PM');
    expect(el.textContent).not.toMatch(/\d{4}-\d{2}-\d{2}/);
    const link = el.querySelector('a')!;
    // NANP national format (libphonenumber-js); RFC 3966 tel: URI.
    expect(link.textContent).toBe('Call (816) 555-0142');
    expect(link.getAttribute('href')).toBe('tel:+18165550142');
  });
});

describe('calendar days and wall-clock instants', () => {
  it('counts calendar days across month, year and leap-day ends, and across daylight-saving changes', () => {
    expect(addDays('2027-02-28', 1)).toBe('2027-03-01');
    expect(addDays('2028-02-28', 1)).toBe('2028-02-29');
    expect(addDays('2026-12-31', 1)).toBe('2027-01-01');
    expect(addDays('2026-03-01', -1)).toBe('2026-02-28');
    // Chicago springs forward on 8 March 2026 and falls back on 1 November 2026 (IANA tz database).
    expect(addDays('2026-03-07', 2)).toBe('2026-03-09');
    expect(addDays('2026-10-31', 7)).toBe('2026-11-07');
    expect(() => addDays('March 7', 1)).toThrow(/day/);
  });

  it('starts a week on its Monday', () => {
    expect(weekStart('2026-12-03')).toBe('2026-11-30'); // a Thursday
    expect(weekStart('2026-11-30')).toBe('2026-11-30'); // a Monday
    expect(weekStart('2026-12-06')).toBe('2026-11-30'); // a Sunday
    expect(weekStart('2027-01-01')).toBe('2026-12-28'); // over New Year
    expect(weekStart('2026-03-08')).toBe('2026-03-02'); // the Sunday the clocks change
  });

  it('writes the bounds of a date-time field in the company zone, months ahead with the day clamped', () => {
    // 3 Dec 2026 16:05 UTC is 10:05 in Chicago (CST, UTC−6) and 5:05 the next morning in Auckland (NZDT, UTC+13).
    const at = new Date('2026-12-03T16:05:00Z');
    expect(dateTimeInputValue(at, 'America/Chicago')).toBe('2026-12-03T10:05');
    expect(dateTimeInputValue(at, 'Pacific/Auckland')).toBe('2026-12-04T05:05');
    expect(dateTimeInputValue(at, 'America/Chicago', { months: 12 })).toBe('2027-12-03T10:05');
    // 31 Jan plus one month is the last day of February, 29 in a leap year.
    expect(dateTimeInputValue(new Date('2028-01-31T18:00:00Z'), 'America/Chicago', { months: 1 })).toBe('2028-02-29T12:00');
    expect(dateTimeInputValue(new Date('2026-11-30T18:00:00Z'), 'America/Chicago', { months: 3 })).toBe('2027-02-28T12:00');
    // Midnight is 00, not 24.
    expect(dateTimeInputValue(new Date('2026-12-03T06:00:00Z'), 'America/Chicago')).toBe('2026-12-03T00:00');
  });

  it('finds the instant a clock in the company zone reads a time, on either side of a daylight-saving change', () => {
    // CST is UTC−6, CDT UTC−5.
    expect(zonedInstant('2026-03-07', '09:00', 'America/Chicago').toISOString()).toBe('2026-03-07T15:00:00.000Z');
    expect(zonedInstant('2026-03-09', '09:00', 'America/Chicago').toISOString()).toBe('2026-03-09T14:00:00.000Z');
    expect(zonedInstant('2026-03-08', '00:00', 'America/Chicago').toISOString()).toBe('2026-03-08T06:00:00.000Z');
    expect(zonedInstant('2026-03-08', '09:00', 'America/Chicago').toISOString()).toBe('2026-03-08T14:00:00.000Z');
    // 2:30 AM does not happen that night: the clock reads 3:30 AM CDT.
    expect(zonedInstant('2026-03-08', '02:30', 'America/Chicago').toISOString()).toBe('2026-03-08T08:30:00.000Z');
    // 1:30 AM happens twice on 1 November: the first time, still CDT.
    expect(zonedInstant('2026-11-01', '01:30', 'America/Chicago').toISOString()).toBe('2026-11-01T06:30:00.000Z');
    expect(zonedInstant('2026-11-01', '09:00', 'America/Chicago').toISOString()).toBe('2026-11-01T15:00:00.000Z');
    // A day is 23 hours long in spring and 25 in fall.
    const hours = (day: string) => (zonedInstant(addDays(day, 1), '00:00', 'America/Chicago').getTime() - zonedInstant(day, '00:00', 'America/Chicago').getTime()) / 3_600_000;
    expect([hours('2026-03-08'), hours('2026-11-01'), hours('2026-11-02')]).toEqual([23, 25, 24]);
    // South of the equator the clocks go back in April (Auckland: NZDT UTC+13 until 5 April 2026, then NZST UTC+12).
    expect(zonedInstant('2026-04-06', '08:00', 'Pacific/Auckland').toISOString()).toBe('2026-04-05T20:00:00.000Z');
    expect(zonedInstant('2026-04-04', '08:00', 'Pacific/Auckland').toISOString()).toBe('2026-04-03T19:00:00.000Z');
    expect(zonedInstant('2026-06-01', '12:00', 'UTC').toISOString()).toBe('2026-06-01T12:00:00.000Z');
    expect(() => zonedInstant('2026-06-01', '9:00', 'UTC')).toThrow(/time/);
  });

  it('agrees with the day an instant falls on where the company works', () => {
    for (const day of ['2026-03-08', '2026-11-01', '2026-12-31']) {
      const start = zonedInstant(day, '00:00', 'America/Chicago');
      expect(dayLabel(start, 'America/Chicago')).toBe(dayLabel(day, 'America/Chicago'));
      expect(dayLabel(new Date(start.getTime() - 1), 'America/Chicago')).toBe(dayLabel(addDays(day, -1), 'America/Chicago'));
    }
  });
});
