import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { Component, signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { Session } from '../core/session';
import { DateTimePipe, DayPipe, dateTimeLabel, dayLabel, shortDayLabel, timeLabel } from './dates';
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
