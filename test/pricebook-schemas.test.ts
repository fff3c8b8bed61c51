import { describe, expect, it } from 'vitest';
import type { z } from 'zod';
import { formatHorsepower, parseHorsepower, parseVoltRanges } from '../shared/pricebook';
import {
  capacitorSpecSchema,
  contactorSpecSchema,
  directInvoiceSchema,
  failedMotorSchema,
  filterSpecSchema,
  flatRateTaskInputSchema,
  motorSpecSchema,
  partSpecSchema,
  priceBookItemInputSchema,
  priceBookItemUpdateSchema,
  priceBookMappingSchema,
  quoteApproveSchema,
  quoteCreateSchema,
  quoteDeclineSchema,
  quoteLineInputSchema,
  refrigerantSpecSchema,
  restockSchema,
  stockLocationInputSchema,
  transferSchema,
} from '../shared/schemas/pricebook';

const ID = '0b6f3c1e-8a44-4a6e-9f51-3d1c2b7a9e10';
const ID2 = '5d2a7f90-1c3b-4e8d-a6f2-9b0e4c7d1a23';

/** Each refused field's path and message, so a test can check the message names the field. */
function problems(schema: z.ZodType, value: unknown): Record<string, string> {
  const r = schema.safeParse(value);
  if (r.success) return {};
  return Object.fromEntries(r.error.issues.map((i) => [i.path.join('.'), i.message]));
}

const motor = {
  category: 'motor',
  application: 'indoor blower',
  horsepower: '1/3',
  volts: '208-230',
  phase: '1',
  rpm: '1075',
  speeds: 3,
  rotation: 'CCW',
  rotationViewedFrom: 'lead end',
  shaft: { diameterIn: 0.5, lengthIn: 4 },
  frame: '48',
  fla: '2.8',
  taps: [{ horsepower: '1/3', microfarads: 7.5 }],
  capacitorVolts: 370,
};

describe('nameplate notation', () => {
  it('reads fractional horsepower and writes it back the way nameplates print it', () => {
    expect(parseHorsepower('1/3')).toBeCloseTo(1 / 3);
    expect(parseHorsepower('3/4 HP')).toBe(0.75);
    expect(parseHorsepower('1 1/2')).toBe(1.5);
    expect(parseHorsepower('half')).toBeNull();
    expect(formatHorsepower(1 / 3)).toBe('1/3 hp');
    expect(formatHorsepower(1.5)).toBe('1 1/2 hp');
  });

  it('reads a dual-rated span and a dual-voltage rating apart', () => {
    // "208/230" is one winding across the span; "115/230" is either voltage by wiring (common practice).
    expect(parseVoltRanges('208-230')).toEqual([{ min: 208, max: 230 }]);
    expect(parseVoltRanges('208/230')).toEqual([{ min: 208, max: 230 }]);
    expect(parseVoltRanges('115/230')).toEqual([
      { min: 115, max: 115 },
      { min: 230, max: 230 },
    ]);
    expect(parseVoltRanges('115/208-230 V')).toEqual([
      { min: 115, max: 115 },
      { min: 208, max: 230 },
    ]);
    expect(parseVoltRanges('about 230')).toBeNull();
  });
});

describe('part specifications by category', () => {
  it('accepts a motor and stores horsepower and volts as ranges', () => {
    const m = motorSpecSchema.parse(motor);
    expect(m.horsepower.min).toBeCloseTo(1 / 3);
    expect(m.horsepower.max).toBe(m.horsepower.min);
    expect(m.volts).toEqual([{ min: 208, max: 230 }]);
    expect(m).toMatchObject({ application: 'indoor_blower', phase: 1, rpm: 1075, rotation: 'ccw', rotationViewedFrom: 'lead_end', fla: 2.8 });
    const multi = motorSpecSchema.parse({
      ...motor,
      horsepower: '1/6-1/2',
      rotation: 'reversible',
      rotationViewedFrom: null,
      taps: [
        { horsepower: '1/6', microfarads: 5 },
        { horsepower: '1/2', microfarads: 10, amps: 3.6 },
      ],
    });
    expect(multi.horsepower.max).toBe(0.5);
    expect(multi.taps[1]).toEqual({ horsepower: 0.5, microfarads: 10, amps: 3.6 });
  });

  it('refuses a bad motor, naming each field', () => {
    expect(problems(motorSpecSchema, { ...motor, horsepower: 'big' })).toEqual({
      'horsepower.min': 'Horsepower is a number like 1/3 or 0.5.',
      'horsepower.max': 'Horsepower is a number like 1/3 or 0.5.',
    });
    expect(problems(motorSpecSchema, { ...motor, horsepower: '1/2-1/6' })).toEqual({ 'horsepower.max': 'Horsepower range goes from the smaller to the larger value.' });
    expect(problems(motorSpecSchema, { ...motor, phase: 2 })).toEqual({ phase: 'Phase is 1 or 3.' });
    expect(problems(motorSpecSchema, { ...motor, rpm: 5000 })).toEqual({ rpm: 'RPM is at most 3600.' });
    expect(problems(motorSpecSchema, { ...motor, volts: 'lots' })).toEqual({ volts: 'Volts is a voltage like 230, or a span like 208-230.' });
    expect(problems(motorSpecSchema, { ...motor, rotation: 'sideways' })).toEqual({ rotation: 'Rotation is reversible, CW or CCW.' });
    expect(problems(motorSpecSchema, { ...motor, rotationViewedFrom: null })).toEqual({ rotationViewedFrom: 'Say whether rotation is seen from the shaft end or the lead end.' });
    expect(problems(motorSpecSchema, { ...motor, fla: 0 })).toEqual({ fla: 'Rated amps (FLA) is at least 0.1 A.' });
    expect(problems(motorSpecSchema, { ...motor, shaft: { diameterIn: 0.5, lengthIn: 40 } })).toEqual({ 'shaft.lengthIn': 'Shaft length is at most 12 in.' });
    expect(problems(motorSpecSchema, { ...motor, taps: [{ horsepower: '1/2', microfarads: 10 }] })).toEqual({
      'taps.0.horsepower': "Tap 1/2 hp is outside the motor's horsepower.",
    });
    expect(problems(motorSpecSchema, { ...motor, capacitorVolts: null })).toEqual({ capacitorVolts: 'Give the capacitor volts (370 or 440) for the horsepower taps.' });
  });

  it('accepts a capacitor of one or two sections and refuses bad ones, naming the field', () => {
    expect(capacitorSpecSchema.parse({ category: 'capacitor', microfarads: '40/5', volts: 440, shape: 'Oval' })).toEqual({
      category: 'capacitor',
      microfarads: [40, 5],
      volts: 440,
      shape: 'oval',
      tolerancePct: 6,
    });
    expect(capacitorSpecSchema.parse({ category: 'capacitor', microfarads: '7.5 MFD', volts: '370', shape: 'round', tolerancePct: 5 }).microfarads).toEqual([7.5]);
    expect(problems(capacitorSpecSchema, { category: 'capacitor', microfarads: '40/5/5', volts: 370, shape: 'round' })).toEqual({
      microfarads: 'A capacitor has one or two sections, like 40/5.',
    });
    expect(problems(capacitorSpecSchema, { category: 'capacitor', microfarads: '40', volts: 370, shape: 'square' })).toEqual({ shape: 'Shape is round or oval.' });
    expect(problems(capacitorSpecSchema, { category: 'capacitor', microfarads: '40', volts: 50, shape: 'round' })).toEqual({ volts: 'Capacitor volts is at least 110.' });
    expect(problems(capacitorSpecSchema, { category: 'capacitor', microfarads: 'x', volts: 370, shape: 'round' })).toEqual({ 'microfarads.0': 'Capacitor µF is a number.' });
  });

  it('checks contactors, filters and refrigerant by their own schemas', () => {
    expect(contactorSpecSchema.parse({ category: 'contactor', poles: 2, coilVolts: 24, fla: 40 })).toMatchObject({ poles: 2 });
    expect(problems(contactorSpecSchema, { category: 'contactor', poles: 6, coilVolts: 24, fla: 40 })).toEqual({ poles: 'Poles is at most 4.' });
    expect(filterSpecSchema.parse({ category: 'filter', size: '16 X 25 X 1', merv: 8 })).toEqual({ category: 'filter', size: '16x25x1', merv: 8 });
    expect(problems(filterSpecSchema, { category: 'filter', size: '' })).toEqual({ size: 'Give the filter size, like 16x25x1.' });
    expect(problems(refrigerantSpecSchema, { category: 'refrigerant', refrigerant: 'R-12' })).toEqual({ refrigerant: 'Refrigerant is one of R-410A, R-22, R-32, R-454B, R-407C.' });
  });

  it('picks the schema by category, and refuses an unknown one', () => {
    expect(partSpecSchema.parse({ category: 'igniter', notes: 'Silicon nitride, 120 V' })).toEqual({ category: 'igniter', notes: 'Silicon nitride, 120 V' });
    expect(partSpecSchema.parse(motor).category).toBe('motor');
    expect(problems(partSpecSchema, { category: 'widget' })).toEqual({ category: 'Choose the part category for its specification.' });
    expect(problems(partSpecSchema, { category: 'capacitor', volts: 370, shape: 'round' })).toEqual({ microfarads: 'µF is a value like 7.5, or two like 40/5.' });
  });
});

describe('price-book items and tasks', () => {
  const item = {
    sku: 'cap-45-5-r',
    name: 'Capacitor 45/5 µF 440 V round',
    kind: 'part',
    category: 'capacitor',
    unitCents: 4_799,
    costCents: 1_250,
    taxable: true,
    partsWarrantyMonths: 12,
    spec: { category: 'capacitor', microfarads: '45/5', volts: 440, shape: 'round' },
  };

  it('accepts an item with defaults and an upper-case SKU', () => {
    expect(priceBookItemInputSchema.parse(item)).toMatchObject({ sku: 'CAP-45-5-R', unit: 'each', active: true, spec: { microfarads: [45, 5] } });
  });

  it('refuses prices over the line maximum, a kind that does not fit the category, and a spec of another category', () => {
    expect(problems(priceBookItemInputSchema, { ...item, unitCents: 100_000_000 })).toEqual({ unitCents: 'Unit price can be at most $999,999.99.' });
    expect(problems(priceBookItemInputSchema, { ...item, unitCents: 12.5 })).toEqual({ unitCents: 'Unit price must be whole cents.' });
    expect(problems(priceBookItemInputSchema, { ...item, kind: 'labor', partsWarrantyMonths: 0 })).toEqual({
      category: 'Capacitor is a part category, not labor.',
      spec: 'Only parts have a specification.',
    });
    expect(problems(priceBookItemInputSchema, { ...item, category: 'motor' })).toEqual({ 'spec.category': 'The specification is for a capacitor, but the item is a motor.' });
    expect(problems(priceBookItemInputSchema, { ...item, sku: 'no spaces' })).toEqual({ sku: 'SKU uses letters, digits, dots, dashes or slashes.' });
    expect(problems(priceBookItemInputSchema, { ...item, taxable: 'yes' })).toEqual({ taxable: 'Say whether the item is taxable.' });
    expect(
      problems(priceBookItemInputSchema, {
        sku: 'LAB-1',
        name: 'Repair labor',
        kind: 'labor',
        category: 'repair_labor',
        unitCents: 12_000,
        costCents: 4_000,
        taxable: false,
        partsWarrantyMonths: 12,
      }),
    ).toEqual({ partsWarrantyMonths: 'Only parts carry a parts warranty.' });
  });

  it('updates only what is sent', () => {
    expect(priceBookItemUpdateSchema.parse({ unitCents: 5_299 })).toEqual({ unitCents: 5_299 });
    expect(problems(priceBookItemUpdateSchema, {})).toEqual({ '': 'Send at least one field to change.' });
  });

  it('bundles parts and labor into a flat-rate task, each item once', () => {
    expect(
      flatRateTaskInputSchema.parse({
        sku: 'task-cap',
        name: 'Replace run capacitor',
        components: [
          { itemId: ID, quantity: 1 },
          { itemId: ID2, quantity: 0.5 },
        ],
      }).components,
    ).toHaveLength(2);
    expect(problems(flatRateTaskInputSchema, { sku: 'T', name: 'Replace', components: [] })).toEqual({ components: 'Add at least one part or labor item to the task.' });
    expect(
      problems(flatRateTaskInputSchema, {
        sku: 'T',
        name: 'Replace',
        components: [
          { itemId: ID, quantity: 1 },
          { itemId: ID, quantity: 1 },
        ],
      }),
    ).toEqual({ components: 'Each item appears once in a task; raise its quantity instead.' });
  });

  it('maps CSV columns like the household import, requiring the key ones', () => {
    expect(problems(priceBookMappingSchema, { sku: 'Part #', name: 'Description', kind: 'Type', category: 'Group', unit_price: 'Price' })).toEqual({});
    expect(problems(priceBookMappingSchema, { sku: 'Part #', name: 'Description', kind: 'Type', category: 'Group' })).toEqual({
      unit_price: 'Choose the column that holds the unit price.',
    });
    expect(problems(priceBookMappingSchema, { sku: 'A', name: 'B', kind: 'C', category: 'D', unit_price: 'E', colour: 'F' })).toEqual({
      colour: 'colour is not a price-book column.',
    });
  });
});

describe('quotes', () => {
  const quote = { visitId: ID, options: [{ title: 'Replace the motor', lines: [{ source: 'item', itemId: ID2, quantity: 1 }] }] };

  it('accepts a draft with one option and fills the defaults', () => {
    expect(quoteCreateSchema.parse(quote)).toMatchObject({
      note: '',
      photoIds: [],
      validDays: 30,
      options: [{ description: '', lines: [{ source: 'item', stockLocationId: null, equipmentId: null }] }],
    });
  });

  it('refuses a quote without options, too many, and lines that are not lines', () => {
    expect(problems(quoteCreateSchema, { ...quote, options: [] })).toEqual({ options: 'Add at least one option.' });
    expect(problems(quoteCreateSchema, { ...quote, options: Array(5).fill(quote.options[0]) })).toEqual({ options: 'A quote has at most 4 options.' });
    expect(problems(quoteCreateSchema, { ...quote, options: [{ title: '', lines: [] }] })).toEqual({
      'options.0.title': 'Name the option, like "Replace the motor".',
      'options.0.lines': 'Add at least one line to the option.',
    });
    expect(problems(quoteLineInputSchema, { source: 'wish' })).toEqual({ source: 'A line comes from the price book, a flat-rate task, or is written out.' });
    expect(problems(quoteLineInputSchema, { source: 'item', itemId: ID, quantity: 0 })).toEqual({ quantity: 'Quantity must be more than 0.' });
    expect(problems(quoteLineInputSchema, { source: 'task', taskId: ID, quantity: 1.5 })).toEqual({ quantity: 'A task is done a whole number of times.' });
    expect(
      problems(quoteLineInputSchema, { source: 'custom', description: 'Compressor', kind: 'part', category: 'compressor', quantity: 2, unitCents: 60_000_000, taxable: true }),
    ).toEqual({ unitCents: 'A line can be at most $999,999.99.' });
  });

  it('approves with a typed name and a ticked box; a decline needs a reason', () => {
    expect(quoteApproveSchema.parse({ revision: 2, optionId: ID, typedName: '  Dana Whitfield ', agreed: true }).typedName).toBe('Dana Whitfield');
    expect(problems(quoteApproveSchema, { revision: 2, optionId: ID, typedName: 'D', agreed: false })).toEqual({
      typedName: 'Type your full name to approve.',
      agreed: 'Tick the box to approve the work and its price.',
    });
    expect(problems(quoteDeclineSchema, { revision: 1, reason: '' })).toEqual({ reason: 'Tell us why you are declining, so we can help.' });
    expect(problems(quoteDeclineSchema, { revision: 1 })).toEqual({ reason: 'Tell us why you are declining.' });
  });
});

describe('truck stock and invoices without a quote', () => {
  it('ties a truck to its technician and keeps the shop without one', () => {
    expect(problems(stockLocationInputSchema, { kind: 'truck', name: 'Truck 3' })).toEqual({ technicianId: 'Choose the technician who drives this truck.' });
    expect(problems(stockLocationInputSchema, { kind: 'shop', name: 'Shop', technicianId: ID })).toEqual({ technicianId: 'The shop has no technician.' });
  });

  it('moves whole parts between two different places', () => {
    expect(restockSchema.parse({ locationId: ID, lines: [{ itemId: ID2, quantity: '4' }] }).lines[0]!.quantity).toBe(4);
    expect(problems(restockSchema, { locationId: ID, lines: [{ itemId: ID2, quantity: 0 }] })).toEqual({ 'lines.0.quantity': 'Quantity is at least 1.' });
    expect(problems(transferSchema, { fromLocationId: ID, toLocationId: ID, lines: [{ itemId: ID2, quantity: 1 }] })).toEqual({ toLocationId: 'Choose two different places.' });
  });

  it('invoices work without a quote from price-book lines', () => {
    expect(directInvoiceSchema.parse({ customerId: ID, lines: [{ source: 'item', itemId: ID2, quantity: 1 }] })).toMatchObject({ visitId: null, sendPayLink: true, notes: '' });
    expect(problems(directInvoiceSchema, { customerId: 'nope', lines: [] })).toEqual({ customerId: 'Choose a household.', lines: 'Add at least one line.' });
  });

  it('reads a failed motor’s nameplate for the search, checking the speeds used against the taps', () => {
    const f = { category: 'motor', horsepower: '1/2', volts: '115', phase: 1, rpm: 1075, speeds: 3, speedsUsed: 2, amps: 7.4, rotation: 'cw', rotationViewedFrom: 'shaft_end' };
    expect(failedMotorSchema.parse(f)).toMatchObject({ horsepower: 0.5, supplyVolts: null, tapsInUse: [] });
    expect(problems(failedMotorSchema, { ...f, speedsUsed: 4 })).toEqual({ speedsUsed: 'Speeds used cannot be more than the motor has.' });
    expect(problems(failedMotorSchema, { ...f, tapsInUse: ['high'] })).toEqual({ tapsInUse: 'List one tap for each speed used.' });
  });
});
