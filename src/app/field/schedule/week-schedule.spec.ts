import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import type { VisitView, WeekResponse } from '../../../../shared/schemas/booking';
import { provideIcons } from '../../ui/icons';
import { WeekSchedule } from './week-schedule';

describe('WeekSchedule', () => {
  it('shows the arrival window and the booked work, labelled, as Today does', async () => {
    TestBed.configureTestingModule({ imports: [WeekSchedule], providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting(), provideIcons()] });
    const fixture = TestBed.createComponent(WeekSchedule);
    const http = TestBed.inject(HttpTestingController);
    TestBed.tick();
    // Window 9–11 am, work booked 9:00–10:30 (America/Chicago, CDT).
    const visit = {
      id: 'v1',
      customerName: 'Oduya household',
      address: '1 Test Row',
      reason: 'tune_up',
      kind: 'tune_up',
      status: 'scheduled',
      windowStart: '2031-07-08T09:00:00.000-05:00',
      windowEnd: '2031-07-08T11:00:00.000-05:00',
      windowLabel: 'Tue 8 Jul, 9–11 am',
      startsAt: '2031-07-08T09:00:00.000-05:00',
      endsAt: '2031-07-08T10:30:00.000-05:00',
      member: false,
      planName: null,
    } as unknown as VisitView;
    const week: WeekResponse = {
      start: '2031-07-07',
      end: '2031-07-13',
      timeZone: 'America/Chicago',
      technician: { id: 't', name: 'Priya Dunmore' },
      visits: [visit],
      feed: { active: false, createdAt: null },
    };
    http.expectOne((r) => r.url.startsWith('/api/schedule/week')).flush(week);
    await fixture.whenStable();
    const text = (fixture.nativeElement as HTMLElement).textContent ?? '';
    expect(text).toContain('Arrival 9–11 am');
    expect(text).toContain('1 h 30 min of work booked');
    expect(text).not.toContain('9:00–10:30');
  });
});
