import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import type { FieldEquipment } from '../../../../shared/schemas/field';
import { apiErrors } from '../../core/api-errors';
import { provideIcons } from '../../ui/icons';
import { ReadingsForm } from './readings-form';

const unit = (id: string, extra: Partial<FieldEquipment>): FieldEquipment => ({
  id,
  kind: 'gas_furnace',
  kindLabel: 'Gas furnace',
  make: 'Demo',
  model: 'GF60',
  serial: '',
  installedOn: null,
  ageYears: null,
  refrigerant: null,
  meteringDevice: null,
  capacityBtuh: null,
  nominalTons: null,
  volts: null,
  ratedAmps: null,
  warrantyEndsOn: null,
  underWarranty: null,
  filterSize: '',
  location: '',
  ...extra,
});
const furnace = unit('e-furnace', {});
const heatPump = unit('e-hp', {
  kind: 'heat_pump',
  kindLabel: 'Heat pump',
  model: 'VS36-1',
  refrigerant: 'R-410A',
  meteringDevice: 'eev',
  compressorType: 'variable_speed',
  maxCompressorHz: 110,
});

describe('ReadingsForm', () => {
  it('fills a newly chosen system from its own record, not from what the system before left in the form', async () => {
    localStorage.clear();
    TestBed.configureTestingModule({ imports: [ReadingsForm], providers: [provideHttpClient(withInterceptors([apiErrors])), provideHttpClientTesting(), provideIcons()] });
    const fixture = TestBed.createComponent(ReadingsForm);
    fixture.componentRef.setInput('visitId', 'v1');
    fixture.componentRef.setInput('equipment', [furnace, heatPump]);
    fixture.detectChanges();
    await fixture.whenStable();
    const el = fixture.nativeElement as HTMLElement;
    const [systemSelect] = [...el.querySelectorAll<HTMLSelectElement>('select')];
    expect(systemSelect.value).toBe('e-furnace');

    // What a browser does on choosing an option: the value changes, then "change" fires.
    systemSelect.value = 'e-hp';
    systemSelect.dispatchEvent(new Event('change'));
    fixture.detectChanges();
    await fixture.whenStable();

    const select = (label: string) =>
      [...el.querySelectorAll<HTMLSelectElement>('select')].find((s) => s.closest('mat-form-field')?.querySelector('mat-label')?.textContent?.trim() === label)!;
    expect(select('Metering device').value).toBe('eev');
    expect(select('Refrigerant').value).toBe('R-410A');
    expect(el.textContent).not.toContain('Unsaved readings restored from this phone.');
    expect(localStorage.getItem('sw.field.draft.v1.readings.e-hp')).toBeNull();
  });
});
