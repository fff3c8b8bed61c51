import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting, type TestRequest } from '@angular/common/http/testing';
import type { Type } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import type { FieldVisit } from '../../../../shared/schemas/field';
import { apiErrors } from '../../core/api-errors';
import { provideIcons } from '../../ui/icons';
import { VisitDrafts } from '../visit-drafts';
import { VisitChecklist } from './visit-checklist';
import { VisitNotes } from './visit-notes';

const visit = {
  visit: { id: 'v1', kind: 'tune_up', status: 'on_site', statusLabel: 'On site', findings: '', recommendations: '' },
  customer: { id: 'c1', name: 'Whitfield household', phone: null },
  equipment: [],
  cautions: [],
  season: 'cooling',
  checklist: [
    {
      equipmentId: 'e1',
      equipmentLabel: 'Outdoor unit',
      items: [
        { id: 'coil', text: 'Rinse the condenser coil', result: null, note: '' },
        { id: 'drain', text: 'Clear the condensate drain', result: null, note: '' },
      ],
    },
  ],
} as unknown as FieldVisit;

function setUp<T>(component: Type<T>) {
  localStorage.clear();
  TestBed.configureTestingModule({
    imports: [component],
    providers: [
      provideHttpClient(withInterceptors([apiErrors])),
      provideHttpClientTesting(),
      provideIcons(),
      // The completion dialog then closes on the next microtask instead of after its exit timer.
      { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
    ],
  });
  const fixture = TestBed.createComponent(component);
  fixture.componentRef.setInput('visit', visit);
  return { fixture, http: TestBed.inject(HttpTestingController), el: fixture.nativeElement as HTMLElement, drafts: TestBed.inject(VisitDrafts) };
}

const button = (el: HTMLElement, text: string) => [...el.querySelectorAll('button')].find((b) => b.textContent?.trim() === text)!;

describe('VisitChecklist', () => {
  it('keeps each answer on the phone, sends only answered items, and says when the signal dropped', async () => {
    const { fixture, http, el, drafts } = setUp(VisitChecklist);
    await fixture.whenStable();
    expect(el.textContent).toContain('0 of 2');
    button(el, 'Done').click();
    await fixture.whenStable();
    expect(el.textContent).toContain('1 of 2');
    expect(drafts.read<FieldVisit['checklist']>('v1', 'checklist.cooling')?.[0]?.items[0]?.result).toBe('done');

    button(el, 'Save checklist').click();
    const req = http.expectOne('/api/field/visits/v1/checklist');
    expect(req.request.method).toBe('PUT');
    expect(req.request.body).toEqual({ season: 'cooling', items: [{ equipmentId: 'e1', itemId: 'coil', result: 'done', note: '' }] });
    req.error(new ProgressEvent('error'), { status: 0 });
    await fixture.whenStable();
    expect(el.querySelector('[role="status"]')?.textContent).toContain('No connection: kept on this phone');
    expect(drafts.read('v1', 'checklist.cooling')).not.toBeNull();

    button(el, 'Save checklist').click();
    http.expectOne('/api/field/visits/v1/checklist').flush({ checklist: visit.checklist });
    await fixture.whenStable();
    expect(el.querySelector('[role="status"]')?.textContent).toContain('Checklist saved.');
    expect(drafts.read('v1', 'checklist.cooling')).toBeNull();
    http.verify();
  });
});

const COMPLETE_URL = '/api/field/visits/v1/complete';

/**
 * Answers the completion dialog (nothing skipped, no repair) and returns the request it leads to.
 * The save starts only after the dialog has closed, so this yields to the event loop until the
 * request is there rather than guessing how long that takes; if it never comes, expectOne fails.
 */
async function confirmCompletion(fixture: { whenStable(): Promise<unknown> }, http: HttpTestingController): Promise<TestRequest> {
  await fixture.whenStable();
  const dialog = [...document.querySelectorAll('mat-dialog-container')].at(-1)!;
  expect(dialog.textContent).toContain('Complete this visit?');
  [...dialog.querySelectorAll<HTMLButtonElement>('button')].find((b) => b.textContent?.trim() === 'Complete visit')!.click();
  for (let turn = 0; turn < 100; turn++) {
    const [req] = http.match(COMPLETE_URL);
    if (req) return req;
    await new Promise((r) => setTimeout(r, 0));
    await fixture.whenStable();
  }
  return http.expectOne(COMPLETE_URL);
}

describe('VisitNotes', { timeout: 60_000 }, () => {
  it('shows the server field message under Findings and completes once it is fixed', async () => {
    const { fixture, http, el } = setUp(VisitNotes);
    const completed: unknown[] = [];
    fixture.componentInstance.completed.subscribe((c) => completed.push(c));
    await fixture.whenStable();

    button(el, 'Complete visit').click();
    const rejected = await confirmCompletion(fixture, http);
    rejected.flush(
      { error: { code: 'invalid', message: 'Please check the findings.', fields: { findings: 'Findings are needed to complete the visit' } } },
      { status: 400, statusText: 'Bad Request' },
    );
    // The save runs after the dialog's answer: let its promise settle before reading the page.
    await new Promise((r) => setTimeout(r, 100));
    await fixture.whenStable();
    expect(el.querySelector('mat-error')?.textContent).toContain('Findings are needed to complete the visit');
    expect(completed).toEqual([]);

    const findings = el.querySelector('textarea') as HTMLTextAreaElement;
    findings.value = 'Cleaned the drain.';
    findings.dispatchEvent(new Event('input'));
    button(el, 'Complete visit').click();
    const req = await confirmCompletion(fixture, http);
    expect(req.request.body).toEqual({ findings: 'Cleaned the drain.', recommendations: '', skippedReason: '', repairDone: false });
    req.flush({ id: 'v1', status: 'done', completedAt: '2026-07-14T15:00:00Z', summaryEmailed: true });
    await new Promise((r) => setTimeout(r, 100));
    await fixture.whenStable();
    expect(completed).toHaveLength(1);
    expect(el.textContent).toContain('Visit completed. The homeowner has been sent a summary.');
    http.verify();
  });
});
