import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { ActivatedRoute, convertToParamMap, provideRouter } from '@angular/router';
import type { PartsToLoad as PartsToLoadView, VisitInvoice } from '../../../../shared/schemas/quotes';
import { apiErrors } from '../../core/api-errors';
import { provideIcons } from '../../ui/icons';
import { PartsToLoad } from '../today/parts-to-load';
import { VisitPayments } from './visit-payments';

const open: VisitInvoice = { id: 'i1', number: 1042, status: 'open', totalCents: 18500, discountCents: 2000, balanceCents: 18500, notes: '' };

function setUp(query: Record<string, string> = {}) {
  TestBed.configureTestingModule({
    imports: [VisitPayments],
    providers: [
      provideRouter([]),
      { provide: ActivatedRoute, useValue: { snapshot: { queryParamMap: convertToParamMap(query) } } },
      provideHttpClient(withInterceptors([apiErrors])),
      provideHttpClientTesting(),
      provideIcons(),
    ],
  });
  const fixture = TestBed.createComponent(VisitPayments);
  fixture.componentRef.setInput('visitId', 'v1');
  return { fixture, http: TestBed.inject(HttpTestingController), el: fixture.nativeElement as HTMLElement };
}

const button = (el: HTMLElement, text: string) => [...el.querySelectorAll('button')].find((b) => b.textContent?.trim() === text);

describe('VisitPayments', () => {
  it('offers to pay an open invoice on this device, and shows nothing without invoices', async () => {
    const { fixture, http, el } = setUp();
    TestBed.tick();
    http.expectOne('/api/work-invoices?visitId=v1').flush([]);
    await fixture.whenStable();
    expect(el.querySelector('section')).toBeNull();

    fixture.componentRef.setInput('changes', 1);
    TestBed.tick();
    http.expectOne('/api/work-invoices?visitId=v1').flush([open]);
    await fixture.whenStable();
    expect(el.textContent).toContain('Invoice 1042 · $185.00');
    expect(el.textContent).toContain('Open');
    expect(el.textContent).toContain('plan savings $20.00');
    button(el, 'Pay now on this device')!.click();
    TestBed.tick();
    const req = http.expectOne('/api/work-invoices/i1/checkout');
    expect(req.request.body).toEqual({ visitId: 'v1' });
    req.flush({ error: { code: 'payment_provider_unavailable', message: 'The card processor is not answering.' } }, { status: 502, statusText: 'Bad Gateway' });
    await fixture.whenStable();
    expect(el.querySelector('[role="alert"]')?.textContent).toContain('The card processor is not answering.');
    expect(button(el, 'Pay now on this device')).toBeDefined();
    http.verify();
  });

  it('back from the payment page, records it and shows the invoice paid', async () => {
    const { fixture, http, el } = setUp({ checkout: 'cs_test_123456' });
    TestBed.tick();
    const back = http.expectOne('/api/invoices/checkout-return');
    expect(back.request.body).toEqual({ sessionId: 'cs_test_123456' });
    http.expectOne('/api/work-invoices?visitId=v1').flush([open]);
    back.flush({ state: 'paid', invoiceId: 'i1' });
    TestBed.tick();
    http.expectOne('/api/work-invoices?visitId=v1').flush([{ ...open, status: 'paid', balanceCents: 0 }]);
    await fixture.whenStable();
    expect(el.querySelector('[role="status"]')?.textContent).toContain('Paid on this device.');
    expect(el.textContent).toContain('Paid');
    expect(button(el, 'Pay now on this device')).toBeUndefined();
    http.verify();
  });
});

describe('PartsToLoad', () => {
  it('lists what is short on the truck, where the rest is, and what must be ordered', async () => {
    TestBed.configureTestingModule({ imports: [PartsToLoad], providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting(), provideIcons()] });
    const fixture = TestBed.createComponent(PartsToLoad);
    const http = TestBed.inject(HttpTestingController);
    const el = fixture.nativeElement as HTMLElement;
    TestBed.tick();
    const body: PartsToLoadView = {
      parts: [
        {
          itemId: 'm1',
          sku: 'MTR-1',
          name: 'Blower motor',
          needed: 2,
          onTruck: 1,
          short: 1,
          visits: [{ visitId: 'v1', customerName: 'Calloway household' }],
          elsewhere: [
            { locationId: 's', name: 'Shop', kind: 'shop', quantity: 3 },
            { locationId: 't2', name: 'Truck 2', kind: 'truck', quantity: 1 },
          ],
        },
        { itemId: 'r1', sku: 'RLY-1', name: 'Fan relay', needed: 1, onTruck: 0, short: 1, visits: [{ visitId: 'v1', customerName: 'Calloway household' }], elsewhere: [] },
      ],
    };
    http.expectOne('/api/stock/parts-to-load').flush(body);
    await fixture.whenStable();
    const items = [...el.querySelectorAll('li')].map((li) => li.textContent!.replace(/\s+/g, ' '));
    expect(items[0]).toContain('1 × Blower motor');
    expect(items[0]).toContain('need 2, 1 on your truck');
    expect(items[0]).toContain('Load from Shop (3), Truck 2 (1)');
    expect(items[0]).toContain('For Calloway household');
    expect(items[1]).toContain('Not in stock anywhere: order it.');
    http.verify();
  });
});
