import { describe, expect, it } from 'vitest';
import { centsToDollars, dollarsToCents, itemFromRow, rowFromItem, type PriceBookRow } from '../shared/pricebook-csv';
import { PRICE_BOOK_EXPORT_COLUMNS, type PriceBookItemInput } from '../shared/schemas/pricebook';

const motorRow: PriceBookRow = {
  sku: 'mtr-13-mh',
  name: 'Blower motor 1/6–1/2 hp multi-hp, 4 speed',
  kind: 'part',
  category: 'Motor',
  unit_price: '$389.00',
  cost: '142.5',
  taxable: 'Yes',
  warranty_months: '12',
  application: 'indoor blower',
  hp: '1/6-1/2',
  volts: '208/230',
  phase: '1',
  rpm: '1075',
  speeds: '4',
  rotation: 'reversible',
  shaft_diameter: '0.5',
  shaft_length: '5',
  frame: '48',
  fla: '3.6',
  capacitor_taps: '1/6:5:1.6; 1/4:5; 1/3:10:2.6; 1/2:15:3.6',
  capacitor_volts: '370',
};

const valueOf = (row: PriceBookRow): PriceBookItemInput => {
  const r = itemFromRow(row);
  if (!r.value) throw new Error(JSON.stringify(r.problems));
  return r.value;
};

describe('price-book CSV rows', () => {
  it('reads dollars exactly as cents', () => {
    expect(dollarsToCents('$1,234.50')).toBe(123_450);
    expect(dollarsToCents('0.1')).toBe(10);
    expect(dollarsToCents('19.99')).toBe(1_999);
    expect(dollarsToCents('12.345')).toBeNull();
    expect(dollarsToCents('-5')).toBeNull();
    expect(centsToDollars(123_405)).toBe('1234.05');
  });

  it('reads a motor row with its spec columns', () => {
    const v = valueOf(motorRow);
    expect(v).toMatchObject({ sku: 'MTR-13-MH', kind: 'part', category: 'motor', unitCents: 38_900, costCents: 14_250, taxable: true, partsWarrantyMonths: 12 });
    expect(v.spec).toMatchObject({ category: 'motor', volts: [{ min: 208, max: 230 }], rotation: 'reversible', speeds: 4, capacitorVolts: 370 });
    expect(v.spec?.category === 'motor' && v.spec.taps.map((t) => [t.microfarads, t.amps])).toEqual([
      [5, 1.6],
      [5, null],
      [10, 2.6],
      [15, 3.6],
    ]);
  });

  it('exports every column and imports the export back unchanged', () => {
    const capacitor = valueOf({
      sku: 'CAP-40-5-R',
      name: 'Capacitor 40/5 µF 370 V round',
      kind: 'part',
      category: 'capacitor',
      unit_price: '47.99',
      taxable: 'yes',
      microfarads: '40/5',
      volts: '370',
      shape: 'round',
    });
    const labor = valueOf({ sku: 'LAB-HR', name: 'Repair labor, per hour', kind: 'labor', category: 'repair_labor', unit: 'hour', unit_price: '120' });
    expect(labor.taxable).toBe(false);
    for (const item of [valueOf(motorRow), capacitor, labor]) {
      const row = rowFromItem(item);
      expect(Object.keys(row)).toEqual(PRICE_BOOK_EXPORT_COLUMNS);
      expect(valueOf(row)).toEqual(item);
    }
  });

  it('names the column of each problem, row by row, as the household import does', () => {
    expect(itemFromRow({ ...motorRow, unit_price: 'twelve' }).problems).toEqual([{ field: 'unit_price', message: 'Unit price is an amount in dollars, like 12.50.' }]);
    expect(itemFromRow({ ...motorRow, unit_price: '' }).problems).toEqual([{ field: 'unit_price', message: 'Give the unit price.' }]);
    expect(itemFromRow({ ...motorRow, taxable: 'maybe' }).problems).toEqual([{ field: 'taxable', message: 'Taxable is yes or no.' }]);
    expect(itemFromRow({ ...motorRow, hp: 'big' }).problems).toEqual([{ field: 'hp', message: 'Horsepower is a number like 1/3 or 0.5.' }]);
    expect(itemFromRow({ ...motorRow, shaft_length: '40' }).problems).toEqual([{ field: 'shaft_length', message: 'Shaft length is at most 12 in.' }]);
    expect(itemFromRow({ ...motorRow, capacitor_taps: '1:10' }).problems).toEqual([{ field: 'capacitor_taps', message: "Tap 1 hp is outside the motor's horsepower." }]);
    expect(itemFromRow({ ...motorRow, category: 'gizmo' }).problems).toEqual([{ field: 'category', message: 'Choose a category from the price book.' }]);
    expect(itemFromRow({ sku: 'CAP-X', name: 'Cap', kind: 'part', category: 'cap', unit_price: '10', microfarads: '40', volts: '370', shape: 'square' }).problems).toEqual([
      { field: 'shape', message: 'Shape is round or oval.' },
    ]);
  });
});
