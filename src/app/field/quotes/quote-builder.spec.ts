import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting, type TestRequest } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { coverOption, type QuoteAgreement } from '../../../../shared/quote-coverage';
import type { FieldVisit } from '../../../../shared/schemas/field';
import type { PriceBookItem, QuoteCreate, QuoteOptionView } from '../../../../shared/schemas/pricebook';
import { DEFAULT_DISCOUNT_CATEGORIES } from '../../../../shared/pricebook';
import { apiErrors } from '../../core/api-errors';
import { provideIcons } from '../../ui/icons';
import { QuoteBuilder } from './quote-builder';

const VISIT_ID = '00000000-0000-4000-8000-000000000001';
const visit = {
  visit: { id: VISIT_ID, kind: 'service_call', status: 'on_site', onDate: '2026-07-14' },
  customer: { id: '00000000-0000-4000-8000-000000000002', name: 'Oduya household', phone: null },
  equipment: [{ id: '00000000-0000-4000-8000-000000000003', kindLabel: 'Furnace', make: 'Acme', model: 'F1' }],
  photos: [],
} as unknown as FieldVisit;

const item = (id: string, name: string, kind: 'part' | 'labor', category: 'motor' | 'repair_labor', unitCents: number, taxable: boolean) =>
  ({
    id,
    versionId: id,
    version: 1,
    sku: name.toUpperCase().slice(0, 6),
    name,
    kind,
    category,
    unit: kind === 'labor' ? 'hour' : 'each',
    unitCents,
    costCents: 0,
    taxable,
    partsWarrantyMonths: 0,
    spec: null,
    active: true,
    updatedAt: '',
  }) as PriceBookItem;
const MOTOR = item('00000000-0000-4000-8000-0000000000a1', 'Blower motor 1/2 hp', 'part', 'motor', 30000, true);
const LABOR = item('00000000-0000-4000-8000-0000000000a2', 'Repair labor', 'labor', 'repair_labor', 12000, false);
const BOOK = [MOTOR, LABOR];

const plan: QuoteAgreement = {
  status: 'active',
  startsOn: '2026-03-01',
  endsOn: '2027-03-01',
  planName: 'Priority Comfort',
  repairDiscountBps: 1500,
  diagnosticFeeWaived: true,
  warrantyLaborCovered: false,
  tuneUps: { cooling: { included: 1, left: 0 }, heating: { included: 1, left: 1 } },
  discountCategories: DEFAULT_DISCOUNT_CATEGORIES,
};

/** What the server answers for a preview: the shared coverage rules over the priced lines. */
function previewOf(body: QuoteCreate): { options: QuoteOptionView[]; coverageNotes: string[] } {
  const options = body.options.map((o, i) => {
    const lines = o.lines.map((l) => {
      const it = BOOK.find((b) => l.source === 'item' && b.id === l.itemId)!;
      return { description: it.name, kind: it.kind, category: it.category, quantity: l.quantity, unitCents: it.unitCents, taxable: it.taxable };
    });
    const c = coverOption({ agreement: plan, warranty: null, visitDate: '2026-07-14', lines, taxRateBps: 825 });
    return {
      id: `o${i}`,
      title: o.title,
      description: o.description,
      ...c,
      lines: c.lines.map((l, j) => ({ ...l, id: `l${i}-${j}`, itemId: null, itemVersionId: null, taskId: null, group: null, sku: null, stockLocationId: null })),
    };
  });
  return { options, coverageNotes: [] };
}

const settle = (ms = 350) => new Promise((r) => setTimeout(r, ms));
type Fixture = { detectChanges(): void };
/** Requests stay open until the test answers them, so the page is rendered rather than waited on for stability. */
async function render(fixture: Fixture) {
  await settle(0);
  fixture.detectChanges();
  await settle(0);
}

async function setUp() {
  TestBed.configureTestingModule({ imports: [QuoteBuilder], providers: [provideHttpClient(withInterceptors([apiErrors])), provideHttpClientTesting(), provideIcons()] });
  // The replacement search is a @defer block: its component resolves here.
  await TestBed.compileComponents();
  const fixture = TestBed.createComponent(QuoteBuilder);
  fixture.componentRef.setInput('visit', visit);
  fixture.componentRef.setInput('truckId', '00000000-0000-4000-8000-0000000000f1');
  const http = TestBed.inject(HttpTestingController);
  return { fixture, http, el: fixture.nativeElement as HTMLElement };
}

const byLabel = (el: HTMLElement, label: string) => el.querySelector<HTMLButtonElement>(`button[aria-label="${label}"]`)!;
const button = (el: HTMLElement, text: string) => [...el.querySelectorAll('button')].find((b) => b.textContent?.trim().startsWith(text))!;

async function answerSearch(fixture: Fixture, http: HttpTestingController) {
  await settle(300);
  for (const r of http.match((req) => req.url === '/api/price-book/items')) r.flush({ items: BOOK, total: 2, page: 0, pageSize: 20 });
  await render(fixture);
}

async function answerPreview(fixture: Fixture, http: HttpTestingController): Promise<TestRequest> {
  await settle();
  // On a slow machine the debounce may let an earlier preview out; the latest is the one on screen.
  const reqs = http.match('/api/quotes/preview');
  expect(reqs.length).toBeGreaterThan(0);
  for (const r of reqs) if (!r.cancelled) r.flush(previewOf(r.request.body as QuoteCreate));
  const req = reqs.at(-1)!;
  await render(fixture);
  return req;
}

// The search and the preview wait out their debounce on the real clock, so each test allows for a busy machine.
describe('QuoteBuilder totals', () => {
  it('shows the subtotal, plan savings, tax and total of an option as the coverage rules work them out', async () => {
    const { fixture, http, el } = await setUp();
    await render(fixture);
    http.expectOne((r) => r.url === '/api/quotes' && r.params.get('visitId') === VISIT_ID).flush({ items: [], total: 0, page: 0, pageSize: 20 });
    await answerSearch(fixture, http);

    byLabel(el, `Add ${MOTOR.name}`).click();
    byLabel(el, `Add ${LABOR.name}`).click();
    await render(fixture);
    byLabel(el, `One more ${LABOR.name}`).click();
    await render(fixture);
    const req = await answerPreview(fixture, http);
    const sent = req.request.body as QuoteCreate;
    expect(sent.options).toHaveLength(1);
    expect(sent.options[0]!.lines).toEqual([
      { source: 'item', itemId: MOTOR.id, quantity: 1, stockLocationId: null, equipmentId: visit.equipment[0]!.id },
      { source: 'item', itemId: LABOR.id, quantity: 2, stockLocationId: null, equipmentId: visit.equipment[0]!.id },
    ]);

    // By hand: motor $300.00 + 2 h labor at $120.00 = $540.00. A 15 % repair discount on each
    // line: $45.00 + $36.00 = $81.00. Tax 8.25 % on the taxable motor's $255.00 = $21.0375,
    // rounded half up to $21.04 (shared/money.ts, as on invoices). Total $540 − $81 + $21.04 = $480.04.
    const table = el.querySelector('sw-quote-option-table')!.textContent!;
    expect(table).toContain('Subtotal$540.00');
    expect(table).toContain('Plan savings−$81.00');
    expect(table).toContain('Sales tax$21.04');
    expect(table).toContain('Total$480.04');
    expect(table).toContain('Repair discount 15 %: −$45.00.');
    expect(el.querySelector('[role="tab"]')!.textContent).toContain('$480.04');
    http.verify({ ignoreCancelled: true });
  }, 30_000);

  it('keeps each option its own figures, and an option with no lines yet shows none', async () => {
    const { fixture, http, el } = await setUp();
    await render(fixture);
    http.expectOne((r) => r.url === '/api/quotes').flush({ items: [], total: 0, page: 0, pageSize: 20 });
    await answerSearch(fixture, http);
    byLabel(el, `Add ${LABOR.name}`).click();
    await render(fixture);
    await answerPreview(fixture, http);

    button(el, 'Add an option').click();
    await render(fixture);
    await answerSearch(fixture, http);
    // The new option is empty: the preview carries only the first.
    const req = await answerPreview(fixture, http);
    expect((req.request.body as QuoteCreate).options).toHaveLength(1);
    const tabs = [...el.querySelectorAll('[role="tab"]')].map((t) => t.textContent!.replace(/\s+/g, ' ').trim());
    // By hand: $120.00 labor − 15 % ($18.00), not taxable: $102.00.
    expect(tabs).toEqual(['Repair · $102.00', 'Replace']);
    expect(el.textContent).toContain('No lines yet.');

    byLabel(el, `Add ${MOTOR.name}`).click();
    await render(fixture);
    await answerPreview(fixture, http);
    // By hand: $300.00 − 15 % ($45.00) = $255.00, plus 8.25 % tax $21.04 = $276.04.
    expect([...el.querySelectorAll('[role="tab"]')].map((t) => t.textContent!.replace(/\s+/g, ' ').trim())).toEqual(['Repair · $102.00', 'Replace · $276.04']);
    http.verify({ ignoreCancelled: true });
  }, 30_000);
});
