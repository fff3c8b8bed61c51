import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { findReplacements, type PartCandidate } from '../../../../shared/part-matching';
import { failedMotorSchema, type MotorSpec, type ReplacementSearch as SearchBody } from '../../../../shared/schemas/pricebook';
import { apiErrors } from '../../core/api-errors';
import { provideIcons } from '../../ui/icons';
import type { PickedLine } from './quote-draft';
import { ReplacementSearch } from './replacement-search';

const TRUCK = { id: '00000000-0000-4000-8000-0000000000f1', kind: 'truck' as const, name: 'Truck 2' };
const SHOP = { id: '00000000-0000-4000-8000-0000000000f9', kind: 'shop' as const, name: 'Shop' };

const motor = (rpm: number, extra: Partial<MotorSpec> = {}): MotorSpec => ({
  category: 'motor',
  application: 'indoor_blower',
  horsepower: { min: 0.5, max: 0.5 },
  volts: [{ min: 115, max: 115 }],
  phase: 1,
  rpm,
  speeds: 3,
  rotation: 'reversible',
  rotationViewedFrom: null,
  shaft: null,
  frame: '48',
  fla: 7.4,
  taps: [{ horsepower: 0.5, microfarads: 10, amps: null }],
  capacitorVolts: 370,
  ...extra,
});
const candidates: PartCandidate[] = [
  { itemId: '00000000-0000-4000-8000-0000000000b1', sku: 'MTR-12-3S', name: 'Blower motor 1/2 hp 115 V 3-speed', spec: motor(1075), location: TRUCK, quantity: 1 },
  { itemId: '00000000-0000-4000-8000-0000000000b2', sku: 'MTR-12-HS', name: 'Blower motor 1/2 hp 1625 RPM', spec: motor(1625), location: SHOP, quantity: 2 },
  {
    itemId: '00000000-0000-4000-8000-0000000000c1',
    sku: 'CAP-10-370',
    name: 'Run capacitor 10 µF 370 V',
    spec: { category: 'capacitor', microfarads: [10], volts: 370, shape: 'oval', tolerancePct: 6 },
    location: TRUCK,
    quantity: 3,
  },
];

function setUp() {
  TestBed.configureTestingModule({ imports: [ReplacementSearch], providers: [provideHttpClient(withInterceptors([apiErrors])), provideHttpClientTesting(), provideIcons()] });
  const fixture = TestBed.createComponent(ReplacementSearch);
  fixture.componentRef.setInput('visitId', '00000000-0000-4000-8000-000000000001');
  fixture.componentRef.setInput('options', ['Repair the motor']);
  const added: { option: number; lines: PickedLine[] }[] = [];
  fixture.componentInstance.add.subscribe((e) => added.push(e));
  return { fixture, http: TestBed.inject(HttpTestingController), el: fixture.nativeElement as HTMLElement, added };
}

function type(el: HTMLElement, label: string, value: string) {
  const field = [...el.querySelectorAll('mat-form-field')].find((f) => f.querySelector('mat-label')?.textContent?.trim() === label)!;
  const input = field.querySelector('input')!;
  input.value = value;
  input.dispatchEvent(new Event('input'));
}
const button = (el: HTMLElement, text: string) => [...el.querySelectorAll('button')].find((b) => b.textContent?.trim() === text)!;

describe('ReplacementSearch', () => {
  it('says which nameplate value is missing before asking the server', async () => {
    const { fixture, http, el } = setUp();
    await fixture.whenStable();
    type(el, 'Horsepower', '1/2');
    button(el, 'Find motors that fit').click();
    await fixture.whenStable();
    http.expectNone('/api/stock/replacements');
    expect(el.querySelector('[role="alert"]')?.textContent).toContain('Check the values marked below.');
    expect(el.textContent).toContain('RPM is a number.');
  });

  it('sends the nameplate, lists the truck part first with what matches and what the swap needs, and adds it with its capacitor', async () => {
    const { fixture, http, el, added } = setUp();
    await fixture.whenStable();
    type(el, 'Horsepower', '1/2');
    type(el, 'Nameplate volts', '115');
    type(el, 'RPM', '1075');
    type(el, 'Speeds', '3');
    type(el, 'Speeds used', '2');
    type(el, 'Rated amps', '7.6');
    button(el, 'Find motors that fit').click();
    await fixture.whenStable();

    const req = http.expectOne('/api/stock/replacements');
    const body = req.request.body as SearchBody;
    // "1/2" is half a horsepower and "115" one rating of 115 V, as the server's own schema reads them.
    expect(body.failed).toMatchObject({
      category: 'motor',
      horsepower: 0.5,
      volts: [{ min: 115, max: 115 }],
      phase: 1,
      rpm: 1075,
      speeds: 3,
      speedsUsed: 2,
      amps: 7.6,
      rotation: 'unknown',
    });
    const failed = failedMotorSchema.parse(body.failed);
    req.flush(findReplacements({ failed, candidates, thisTruckId: TRUCK.id }));
    await fixture.whenStable();

    const fits = el.querySelector('[aria-label="Parts that fit"]')!;
    const first = fits.querySelector('li.fit')!;
    expect(first.textContent).toContain('Blower motor 1/2 hp 115 V 3-speed');
    expect(first.textContent).toContain('On your truck: Truck 2, 1 there');
    expect(first.textContent).toContain('Reversible.');
    // The 1625 RPM motor turns a different speed class from 1075 RPM (six poles against four: induction-motor theory).
    expect(el.querySelector('details.refused')?.textContent).toContain('Blower motor 1/2 hp 1625 RPM');
    expect(first.textContent).toContain('Run capacitor for this tap: 10 µF, 370 V');
    expect(first.querySelector('.needs')?.textContent).toContain('Set the rotation');

    first.querySelector<HTMLButtonElement>('button[aria-label^="Add Blower motor 1/2 hp 115 V 3-speed with"]')!.click();
    await fixture.whenStable();
    expect(added).toHaveLength(1);
    expect(added[0]!.option).toBe(0);
    expect(added[0]!.lines.map((l) => [l.refId, l.stockLocationId])).toEqual([
      [candidates[0]!.itemId, TRUCK.id],
      [candidates[2]!.itemId, TRUCK.id],
    ]);
    expect(el.querySelector('[role="status"]')?.textContent).toContain('to Repair the motor');
  });
});
