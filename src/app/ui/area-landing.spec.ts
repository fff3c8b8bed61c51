import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { AreaLanding } from './area-landing';
import { provideIcons } from './icons';

describe('AreaLanding', () => {
  it('renders the heading and one card per task, linking where a path is given', async () => {
    TestBed.configureTestingModule({ imports: [AreaLanding], providers: [provideRouter([]), provideIcons()] });
    const fixture = TestBed.createComponent(AreaLanding);
    fixture.componentRef.setInput('heading', 'Office');
    fixture.componentRef.setInput('lead', 'Customers and visits.');
    fixture.componentRef.setInput('tiles', [
      { title: 'Customers', text: 'Households.', icon: 'people', path: '/office/customers' },
      { title: 'Dispatch', text: 'The board.', icon: 'dispatch' },
    ]);
    await fixture.whenStable();
    const el: HTMLElement = fixture.nativeElement;
    expect(el.querySelector('h1')?.textContent).toContain('Office');
    expect(el.querySelectorAll('mat-card').length).toBe(2);
    expect(el.querySelector('a')?.getAttribute('href')).toBe('/office/customers');
  });
});
