import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { provideIcons } from '../../ui/icons';
import { VisitRequest } from './visit-request';
import { groupByDay } from './window-days';

// Stepping through a whole stepper in jsdom is slow on a busy machine.
describe('VisitRequest', { timeout: 60_000 }, () => {
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

  it('says what is missing when Next is pressed on the reason step with nothing chosen', async () => {
    TestBed.configureTestingModule({ imports: [VisitRequest], providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting(), provideIcons()] });
    const fixture = TestBed.createComponent(VisitRequest);
    const http = TestBed.inject(HttpTestingController);
    TestBed.tick();
    const home = {
      id: '00000000-0000-4000-8000-000000000001',
      customerId: '00000000-0000-4000-8000-000000000002',
      customerName: 'Oduya household',
      label: 'Home',
      address: '1 Kestrel Street, Larkspur Bend, MO 64790',
      area: 'Old Town',
      member: false,
      planName: null,
      priorityWindowHours: null,
    };
    http.expectOne('/api/booking/options').flush({ properties: [home], cancelCutoffHours: 24, companyPhone: '+18165550142', timeZone: 'America/Chicago' });
    await fixture.whenStable();
    const el: HTMLElement = fixture.nativeElement;
    const button = (text: string) => [...el.querySelectorAll<HTMLButtonElement>('button')].filter((b) => b.textContent?.trim() === text && b.offsetParent !== undefined);
    button('No, none of these')[0]!.click();
    await new Promise((r) => setTimeout(r));
    await fixture.whenStable();
    // Property step: the one home is already chosen.
    const nexts = () => [...el.querySelectorAll<HTMLButtonElement>('button')].filter((b) => b.textContent?.trim() === 'Next');
    nexts()[0]!.click();
    await fixture.whenStable();
    expect(el.textContent).not.toContain('Choose the home');
    // Reason step: Next with nothing chosen stays and says why.
    nexts()[1]!.click();
    await fixture.whenStable();
    const msg = el.querySelector('#reason-missing');
    expect(msg?.textContent).toContain('Choose what the visit is for');
    expect(msg?.getAttribute('role')).toBe('alert');
    // Choosing a reason clears the message.
    const radio = el.querySelector<HTMLInputElement>('mat-radio-group[formcontrolname="reason"] input[type="radio"]')!;
    radio.click();
    await fixture.whenStable();
    expect(el.querySelector('#reason-missing')).toBeNull();
  });

  async function toWindows(meets: boolean[]) {
    TestBed.configureTestingModule({ imports: [VisitRequest], providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting(), provideIcons()] });
    const fixture = TestBed.createComponent(VisitRequest);
    const http = TestBed.inject(HttpTestingController);
    TestBed.tick();
    const home = {
      id: '00000000-0000-4000-8000-000000000001',
      customerId: '00000000-0000-4000-8000-000000000002',
      customerName: 'Oduya household',
      label: 'Home',
      address: '1 Kestrel Street, Larkspur Bend, MO 64790',
      area: 'Old Town',
      member: true,
      planName: 'Whole Home Plus',
      priorityWindowHours: 12,
    };
    http.expectOne('/api/booking/options').flush({ properties: [home], cancelCutoffHours: 24, companyPhone: '+18165550142', timeZone: 'America/Chicago' });
    await fixture.whenStable();
    const el: HTMLElement = fixture.nativeElement;
    const click = async (text: string, nth = 0) => {
      [...el.querySelectorAll<HTMLButtonElement>('button')].filter((b) => b.textContent?.trim() === text)[nth]!.click();
      await new Promise((r) => setTimeout(r));
      await fixture.whenStable();
    };
    await click('No, none of these');
    await click('Next', 0);
    el.querySelector<HTMLInputElement>('mat-radio-group[formcontrolname="reason"] input[type="radio"]')!.click();
    await fixture.whenStable();
    await click('Next', 1);
    await click('Next', 2);
    const windows = meets.map((m, i) => ({
      start: `2026-12-0${i + 2}T08:00:00-06:00`,
      end: `2026-12-0${i + 2}T10:00:00-06:00`,
      localLabel: `Wed ${i + 2} Dec, 8–10 am`,
      capacity: 2,
      meetsPriorityPromise: m,
    }));
    http.expectOne((r) => r.url === '/api/booking/windows').flush({ windows, member: true, urgent: true, priorityWindowHours: 12, timeZone: 'America/Chicago' });
    await new Promise((r) => setTimeout(r));
    await fixture.whenStable();
    return el;
  }

  it("marks the windows that keep the plan's promised response time", async () => {
    const el = await toWindows([true, false]);
    expect(el.querySelector('#promise-note')?.textContent).toContain('the windows that keep that promise are marked Priority');
    const badges = [...el.querySelectorAll('.badge.small')].map((b) => b.textContent?.trim());
    expect(badges).toEqual(['Priority']);
  });

  it('does not promise marked windows when none keeps the promise, and gives the number to call', async () => {
    const el = await toWindows([false, false]);
    const note = el.querySelector('#promise-note')!;
    expect(note.textContent).not.toContain('marked Priority');
    expect(note.textContent).toContain('no window that soon is open online');
    // NANP national format (libphonenumber-js) as a tel: link (RFC 3966).
    expect(note.querySelector('a')?.getAttribute('href')).toBe('tel:+18165550142');
    expect(note.querySelector('a')?.textContent).toBe('(816) 555-0142');
    expect(el.querySelectorAll('.badge.small').length).toBe(0);
  });

  it('groups arrival windows under their day', () => {
    const w = (start: string, localLabel: string) => ({ start, end: start, localLabel, capacity: 1, meetsPriorityPromise: false });
    const days = groupByDay([
      w('2026-07-14T08:00:00-05:00', 'Tue 14 Jul, 8–10 am'),
      w('2026-07-14T10:00:00-05:00', 'Tue 14 Jul, 10 am–12 pm'),
      w('2026-07-15T08:00:00-05:00', 'Wed 15 Jul, 8–10 am'),
    ]);
    expect(days.map((d) => d.day)).toEqual(['Tue 14 Jul', 'Wed 15 Jul']);
    expect(days[0]!.windows.map((x) => x.time)).toEqual(['8–10 am', '10 am–12 pm']);
  });
});
