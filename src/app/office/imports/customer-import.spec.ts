import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import type { ImportCheck, ImportCounts, ImportPreview } from '../../../../shared/schemas/customers';
import { apiErrors } from '../../core/api-errors';
import { provideIcons } from '../../ui/icons';
import { CustomerImport } from './customer-import';

const counts: ImportCounts = { customers: { created: 2, matched: 1 }, properties: { created: 3, matched: 0 }, equipment: { created: 4, matched: 0 } };
const preview: ImportPreview = {
  headers: ['Name', 'Street', 'Town', 'St', 'ZIP'],
  sample: [{ Name: 'Ferro household', Street: '12 Hollow Rd', Town: 'Bluestem', St: 'KS', ZIP: '66000' }],
  rowCount: 3,
  // The server matched every required column but the town.
  mapping: { customer_name: 'Name', street: 'Street', city: null, state: 'St', zip: 'ZIP' },
};

function setUp() {
  TestBed.configureTestingModule({
    imports: [CustomerImport],
    providers: [provideHttpClient(withInterceptors([apiErrors])), provideHttpClientTesting(), provideIcons(), provideRouter([])],
  });
  const fixture = TestBed.createComponent(CustomerImport);
  fixture.detectChanges();
  return { fixture, http: TestBed.inject(HttpTestingController), el: fixture.nativeElement as HTMLElement };
}
const button = (el: HTMLElement, text: string) => [...el.querySelectorAll('button')].find((b) => b.textContent?.trim() === text);
const settle = async (fixture: { detectChanges(): void; whenStable(): Promise<unknown> }) => {
  await fixture.whenStable();
  fixture.detectChanges();
};

describe('CustomerImport (the shared CSV import)', () => {
  it('walks pick, match, problems by row, a clean check, the import and back', async () => {
    const { fixture, http, el } = setUp();
    const input = el.querySelector<HTMLInputElement>('input[type=file]')!;
    Object.defineProperty(input, 'files', { value: [new File(['Name,Street\n'], 'households.csv', { type: 'text/csv' })] });
    input.dispatchEvent(new Event('change'));
    const previewCall = http.expectOne('/api/imports/preview');
    expect((previewCall.request.body as FormData).get('mapping')).toBeNull();
    previewCall.flush(preview);
    await settle(fixture);

    expect(el.textContent).toContain('1. Match your columns (3 rows in households.csv)');
    expect(el.textContent).toContain('Still to match: City.');
    expect(button(el, 'Check every row')!.disabled).toBe(true);
    expect(el.querySelector('table.sample td')?.textContent).toBe('Ferro household');

    // Match the town by hand, as the select would.
    (fixture.debugElement.query((d) => d.name === 'sw-csv-import').componentInstance as { setMapping(k: string, c: string): void }).setMapping('city', 'Town');
    await settle(fixture);
    expect(el.textContent).not.toContain('Still to match');
    button(el, 'Check every row')!.click();
    const checkCall = http.expectOne('/api/imports/check');
    expect(JSON.parse((checkCall.request.body as FormData).get('mapping') as string)).toMatchObject({ city: 'Town' });
    const bad: ImportCheck = { valid: false, rowCount: 3, counts: null, problems: [{ row: 3, column: 'ZIP', field: 'zip', message: 'ZIP is five digits.' }] };
    checkCall.flush(bad);
    await settle(fixture);
    expect(el.textContent).toContain('1 problem; nothing will be imported until they are fixed');
    const cells = [...el.querySelectorAll('table[aria-label="Problems by row and column"] td')].map((c) => c.textContent?.trim());
    expect(cells).toEqual(['3', 'ZIP', 'ZIP is five digits.']);
    expect(button(el, 'Import 3 rows')).toBeUndefined();

    button(el, 'Check every row')!.click();
    http.expectOne('/api/imports/check').flush({ valid: true, rowCount: 3, counts, problems: [] } satisfies ImportCheck);
    await settle(fixture);
    expect(el.querySelector('[role=status]')?.textContent?.replace(/\s+/g, ' ').trim()).toBe(
      'All 3 rows are good. Importing adds 2 households (1 already here), 3 properties and 4 pieces of equipment (0 already recorded).',
    );

    button(el, 'Import 3 rows')!.click();
    http.expectOne('/api/imports/run').flush({ rowCount: 3, counts });
    await settle(fixture);
    expect(el.querySelector('[role=status]')?.textContent).toContain('Imported 3 rows: 2 new households, 3 new properties, 4 new pieces of equipment.');
    expect(el.querySelector('a[href="/office/customers"]')?.textContent?.trim()).toBe('See households');

    button(el, 'Import another file')!.click();
    await settle(fixture);
    expect(el.querySelector('input[type=file]')).not.toBeNull();
    expect(el.textContent).toContain('Export a file from the household list');
    http.verify();
  });

  it('shows the server message when the file cannot be read', async () => {
    const { fixture, http, el } = setUp();
    const input = el.querySelector<HTMLInputElement>('input[type=file]')!;
    Object.defineProperty(input, 'files', { value: [new File([''], 'empty.csv')] });
    input.dispatchEvent(new Event('change'));
    http.expectOne('/api/imports/preview').flush({ error: { code: 'validation', message: 'The file has no header row.' } }, { status: 422, statusText: 'Unprocessable' });
    await settle(fixture);
    expect(el.querySelector('[role=alert]')?.textContent).toContain('The file has no header row.');
  });
});
