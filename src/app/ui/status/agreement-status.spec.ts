import { TestBed } from '@angular/core/testing';
import { provideIcons } from '../icons';
import { provideHttpClient } from '@angular/common/http';
import { AgreementStatusBadge } from '../../ui/status/agreement-status';

describe('AgreementStatusBadge', () => {
  it('shows a word and an icon for every status, never colour alone', async () => {
    TestBed.configureTestingModule({ imports: [AgreementStatusBadge], providers: [provideHttpClient(), provideIcons()] });
    const fixture = TestBed.createComponent(AgreementStatusBadge);
    for (const [status, word] of [
      ['renewal_due', 'Renewal due'],
      ['past_due', 'Past due'],
      ['active', 'Active'],
    ] as const) {
      fixture.componentRef.setInput('status', status);
      await fixture.whenStable();
      const el: HTMLElement = fixture.nativeElement;
      expect(el.textContent?.trim()).toBe(word);
      expect(el.querySelector('mat-icon')?.getAttribute('aria-hidden')).toBe('true');
    }
  });
});
