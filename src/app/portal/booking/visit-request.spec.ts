import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { provideIcons } from '../../ui/icons';
import { VisitRequest } from './visit-request';
import { groupByDay } from './window-days';

describe('VisitRequest', () => {
  it('puts the emergency message before any booking step and keeps an emergency off the booking path', async () => {
    TestBed.configureTestingModule({ imports: [VisitRequest], providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting(), provideIcons()] });
    const fixture = TestBed.createComponent(VisitRequest);
    const http = TestBed.inject(HttpTestingController);
    // The options read is pending until answered, so the page is not stable yet: run its effects only.
    TestBed.tick();
    http.expectOne('/api/booking/options').flush({ properties: [], cancelCutoffHours: 24, companyPhone: '+18165550142', timeZone: 'America/Chicago' });
    await fixture.whenStable();
    const el: HTMLElement = fixture.nativeElement;
    expect(el.querySelector('#emergency-title')?.textContent).toContain('Is this an emergency?');
    expect(el.textContent).toContain('I smell gas');
    const yes = [...el.querySelectorAll('button')].find((b) => b.textContent?.includes('Yes, one of these'))!;
    yes.click();
    await fixture.whenStable();
    const alert = el.querySelector('[role="alert"]');
    expect(alert?.textContent).toContain('Leave the building now');
    expect(alert?.textContent).toContain('911');
    // No windows are asked for while an emergency is reported.
    http.expectNone((r) => r.url.startsWith('/api/booking/windows'));
    http.verify();
  });

  it('groups arrival windows under their day', () => {
    const w = (start: string, localLabel: string) => ({ start, end: start, localLabel, capacity: 1, meetsPriorityPromise: false });
    const days = groupByDay([w('2026-07-14T08:00:00-05:00', 'Tue 14 Jul, 8–10 am'), w('2026-07-14T10:00:00-05:00', 'Tue 14 Jul, 10 am–12 pm'), w('2026-07-15T08:00:00-05:00', 'Wed 15 Jul, 8–10 am')]);
    expect(days.map((d) => d.day)).toEqual(['Tue 14 Jul', 'Wed 15 Jul']);
    expect(days[0]!.windows.map((x) => x.time)).toEqual(['8–10 am', '10 am–12 pm']);
  });
});
