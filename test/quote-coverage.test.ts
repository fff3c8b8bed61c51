import { describe, expect, it } from 'vitest';
import { CoverageInputError, coverageFor, type CoverageAgreement } from '../shared/coverage';
import { invoiceTotals } from '../shared/money';
import { DEFAULT_DISCOUNT_CATEGORIES } from '../shared/pricebook';
import { coverOption, coverQuote, invoiceLinesOf, planStanding, quoteAgreementFrom, taskLines, type CoverageLineInput, type QuoteAgreement } from '../shared/quote-coverage';

// Worked examples: every amount is computed by hand in the comment above its assertion.
// Money rules (shared/money.ts, the invoices' own): line gross = qty × unit, rounded half up;
// discount per line = gross × bps ÷ 10 000, rounded half up; tax once on the taxable lines'
// charged amounts, rounded half up.

const VISIT = '2026-07-14';
const TAX = 825; // 8.25 %

const agreement = (over: Partial<QuoteAgreement> = {}): QuoteAgreement => ({
  status: 'active',
  startsOn: '2026-03-10',
  endsOn: '2027-03-10',
  planName: 'Two-Season Care',
  repairDiscountBps: 1500,
  diagnosticFeeWaived: true,
  warrantyLaborCovered: false,
  tuneUps: { cooling: { included: 1, left: 1 }, heating: { included: 1, left: 1 } },
  discountCategories: DEFAULT_DISCOUNT_CATEGORIES,
  ...over,
});

const line = (over: Partial<CoverageLineInput> & Pick<CoverageLineInput, 'kind' | 'category' | 'unitCents'>): CoverageLineInput => ({
  description: over.category,
  quantity: 1,
  taxable: false,
  ...over,
});
const tuneUp = (quantity = 1) => line({ description: 'Cooling tune-up', kind: 'fee', category: 'tune_up', unitCents: 12_900, quantity, season: 'cooling' });
const diagnostic = () => line({ description: 'Diagnostic fee', kind: 'fee', category: 'diagnostic_fee', unitCents: 8_900 });
const laborHours = (hours: number, group: string | null = null) =>
  line({ description: 'Repair labor', kind: 'labor', category: 'repair_labor', unitCents: 12_000, quantity: hours, group });
const blowerMotor = (group: string | null = 'motor-task') =>
  line({ description: 'Indoor blower motor 1/3 hp', kind: 'part', category: 'motor', unitCents: 38_900, taxable: true, group });
const WARRANTY = { partsEndsOn: '2029-03-14' };

const cover = (lines: CoverageLineInput[], over: { agreement?: QuoteAgreement | null; warranty?: { partsEndsOn: string | null } | null; visitDate?: string } = {}) =>
  coverOption({
    agreement: over.agreement === undefined ? agreement() : over.agreement,
    warranty: over.warranty ?? null,
    visitDate: over.visitDate ?? VISIT,
    lines,
    taxRateBps: TAX,
  });

function fieldOf(fn: () => unknown): string | undefined {
  try {
    fn();
  } catch (err) {
    if (err instanceof CoverageInputError) return err.field;
    throw err;
  }
  return undefined;
}

describe('coverage on quote lines: worked examples', () => {
  it('1. a tune-up the plan includes is free', () => {
    const o = cover([tuneUp()]);
    // gross 1 × $129.00 = 12 900; 1 cooling tune-up left → saving 12 900, charged 0; not taxable.
    expect(o.lines[0]).toMatchObject({ grossCents: 12_900, savingsCents: 12_900, chargedCents: 0, rules: ['tune_up_included'] });
    expect(o.lines[0]!.reason).toBe('Tune-up included in your plan: 1 of 1 cooling tune-ups left this season.');
    expect(o).toMatchObject({ subtotalCents: 12_900, savingsCents: 12_900, taxCents: 0, totalCents: 0 });
  });

  it('2. tune-ups beyond the ones left in the season are charged', () => {
    // Two systems, one tune-up left: 2 × 12 900 = 25 800 gross; 1 free → saving 12 900, charged 12 900.
    const two = cover([tuneUp(2)]);
    expect(two.lines[0]).toMatchObject({ grossCents: 25_800, savingsCents: 12_900, chargedCents: 12_900 });
    expect(two.lines[0]!.reason).toBe('Tune-up included in your plan: 1 of 1 cooling tune-ups left this season. The other 1 is charged.');
    // Nothing left this season: the full 12 900 is charged.
    const none = cover([tuneUp()], { agreement: agreement({ tuneUps: { cooling: { included: 1, left: 0 }, heating: { included: 1, left: 1 } } }) });
    expect(none.lines[0]).toMatchObject({ savingsCents: 0, chargedCents: 12_900, rules: ['regular'] });
    expect(none.lines[0]!.reason).toBe('No cooling tune-ups left in your plan this season (1 of 1 used): regular price.');
    // Two tune-up lines in one option share the season's one left: the first is free, the second charged.
    const split = cover([tuneUp(), tuneUp()]);
    expect(split.lines.map((l) => l.chargedCents)).toEqual([0, 12_900]);
  });

  it('3. the diagnostic fee is waived where the plan says so, and only there', () => {
    // $89.00 waived → charged 0, saving 8 900.
    const waived = cover([diagnostic()]);
    expect(waived.lines[0]).toMatchObject({ chargedCents: 0, savingsCents: 8_900, rules: ['diagnostic_waived'], reason: 'Diagnostic fee waived by your plan: no charge.' });
    // Plan without the waiver, and a fee category the owner did not mark for the discount: 8 900 charged.
    const charged = cover([diagnostic()], { agreement: agreement({ diagnosticFeeWaived: false }) });
    expect(charged.lines[0]).toMatchObject({ chargedCents: 8_900, savingsCents: 0, reason: 'Your plan does not waive the diagnostic fee.' });
  });

  it('4. the repair discount applies to eligible lines only', () => {
    const o = cover([laborHours(1.5), line({ description: 'Trip fee', kind: 'fee', category: 'trip_fee', unitCents: 2_500 })]);
    // Labor 1.5 h × $120.00 = 18 000; 15 % of 18 000 = 2 700 → charged 15 300.
    expect(o.lines[0]).toMatchObject({ grossCents: 18_000, savingsCents: 2_700, chargedCents: 15_300, rules: ['repair_discount'] });
    expect(o.lines[0]!.reason).toBe('Repair discount 15 %: −$27.00.');
    // The trip fee is not a discount category: 2 500 charged.
    expect(o.lines[1]).toMatchObject({ chargedCents: 2_500, reason: "Not part of your plan's repair discount: regular price." });
    // Subtotal 18 000 + 2 500 = 20 500; savings 2 700; nothing taxable; total 17 800.
    expect(o).toMatchObject({ subtotalCents: 20_500, savingsCents: 2_700, taxableCents: 0, taxCents: 0, totalCents: 17_800 });
  });

  it('5. a discounted taxable part rounds the discount and then the tax half up, as invoices do', () => {
    const contactor = line({ description: 'Contactor 2-pole 40 A', kind: 'part', category: 'contactor', unitCents: 9_647, taxable: true });
    const o = cover([contactor, laborHours(1)]);
    // Part: 15 % of 9 647 = 1 447.05 → 1 447; charged 9 647 − 1 447 = 8 200.
    expect(o.lines[0]).toMatchObject({ grossCents: 9_647, savingsCents: 1_447, chargedCents: 8_200 });
    // Labor: 15 % of 12 000 = 1 800; charged 10 200 (not taxable).
    expect(o.lines[1]).toMatchObject({ savingsCents: 1_800, chargedCents: 10_200 });
    // Tax on the taxable charged amount: 8 200 × 8.25 % = 676.5 → 677 (half up).
    // Subtotal 9 647 + 12 000 = 21 647; savings 3 247; total 21 647 − 3 247 + 677 = 19 077.
    expect(o).toMatchObject({ subtotalCents: 21_647, savingsCents: 3_247, taxableCents: 8_200, taxCents: 677, totalCents: 19_077 });
  });

  it('6. a part under the manufacturer’s warranty costs nothing; its labor is charged, with the repair discount', () => {
    const o = cover([blowerMotor(), laborHours(2, 'motor-task')], { warranty: WARRANTY });
    // Motor 38 900 → 0 under warranty (so no tax on it).
    expect(o.lines[0]).toMatchObject({ grossCents: 38_900, savingsCents: 38_900, chargedCents: 0, rules: ['warranty_part'] });
    expect(o.lines[0]!.reason).toBe("Part under the manufacturer's warranty until March 14, 2029: no charge; labor is charged.");
    // Labor 2 h × 12 000 = 24 000; 15 % = 3 600 → charged 20 400.
    expect(o.lines[1]).toMatchObject({ grossCents: 24_000, savingsCents: 3_600, chargedCents: 20_400, rules: ['repair_discount'] });
    expect(o.lines[1]!.reason).toBe("Labor to fit a part under the manufacturer's warranty is charged. Repair discount 15 %: −$36.00.");
    // Subtotal 62 900; savings 42 500; taxable 0; total 20 400.
    expect(o).toMatchObject({ subtotalCents: 62_900, savingsCents: 42_500, taxableCents: 0, taxCents: 0, totalCents: 20_400 });
  });

  it('7. a plan that covers labor on warranty parts makes the warranty repair free; refrigerant is still charged and taxed', () => {
    const refrigerant = line({ description: 'R-410A', kind: 'part', category: 'refrigerant', unitCents: 8_500, quantity: 2, taxable: true });
    const o = cover([blowerMotor(), laborHours(2, 'motor-task'), refrigerant], { agreement: agreement({ warrantyLaborCovered: true }), warranty: WARRANTY });
    expect(o.lines[0]!.reason).toBe("Part under the manufacturer's warranty until March 14, 2029: no charge; your plan covers the labor to fit it.");
    // Labor 24 000 → 0.
    expect(o.lines[1]).toMatchObject({ chargedCents: 0, savingsCents: 24_000, rules: ['warranty_labor'] });
    expect(o.lines[1]!.reason).toBe("Labor to fit a part under the manufacturer's warranty: included in your plan.");
    // Refrigerant is not a warranty part nor a discount category: 2 × 8 500 = 17 000 charged.
    expect(o.lines[2]).toMatchObject({ grossCents: 17_000, chargedCents: 17_000 });
    // Tax 17 000 × 8.25 % = 1 402.5 → 1 403. Subtotal 38 900 + 24 000 + 17 000 = 79 900; savings 62 900;
    // total 79 900 − 62 900 + 1 403 = 18 403.
    expect(o).toMatchObject({ subtotalCents: 79_900, savingsCents: 62_900, taxableCents: 17_000, taxCents: 1_403, totalCents: 18_403 });
  });

  it('8. a lapsed agreement covers nothing and says so; the manufacturer’s warranty still holds', () => {
    const o = cover([tuneUp(), diagnostic(), blowerMotor(), laborHours(2, 'motor-task')], { agreement: agreement({ status: 'lapsed' }), warranty: WARRANTY });
    const lapsed = 'Your agreement has lapsed, so no plan benefits apply until it is renewed.';
    expect(o.lines[0]).toMatchObject({ chargedCents: 12_900, reason: lapsed });
    expect(o.lines[1]).toMatchObject({ chargedCents: 8_900, reason: lapsed });
    expect(o.lines[2]).toMatchObject({ chargedCents: 0, reason: "Part under the manufacturer's warranty until March 14, 2029: no charge; labor is charged." });
    expect(o.lines[3]).toMatchObject({ chargedCents: 24_000, reason: `Labor to fit a part under the manufacturer's warranty is charged. ${lapsed}` });
    // Subtotal 12 900 + 8 900 + 38 900 + 24 000 = 84 700; savings 38 900 (the warranty part); total 45 800.
    expect(o).toMatchObject({ subtotalCents: 84_700, savingsCents: 38_900, taxCents: 0, totalCents: 45_800 });
  });

  it('9. a past-due agreement covers nothing until it is paid', () => {
    const o = cover([laborHours(1)], { agreement: agreement({ status: 'past_due' }) });
    // 12 000 charged in full.
    expect(o.lines[0]).toMatchObject({
      chargedCents: 12_000,
      savingsCents: 0,
      rules: ['regular'],
      reason: 'Your agreement is past due, so no plan benefits apply until it is paid.',
    });
  });

  it('10. the warranty ends on its last day, inclusive', () => {
    // Ends on the visit day: still covered.
    expect(cover([blowerMotor()], { warranty: { partsEndsOn: VISIT } }).lines[0]!.chargedCents).toBe(0);
    // Ended the day before: the motor takes the repair discount instead: 15 % of 38 900 = 5 835 → 33 065;
    // tax 33 065 × 8.25 % = 2 727.8625 → 2 728; total 35 793.
    const ended = cover([blowerMotor()], { warranty: { partsEndsOn: '2026-07-13' } });
    expect(ended.lines[0]).toMatchObject({ savingsCents: 5_835, chargedCents: 33_065, reason: 'Repair discount 15 %: −$58.35.' });
    expect(ended).toMatchObject({ taxCents: 2_728, totalCents: 35_793 });
  });

  it('11. with no agreement, regular prices; the totals equal an invoice of the same lines', () => {
    const lines = [laborHours(1.25), line({ description: 'Capacitor 45/5 µF', kind: 'part', category: 'capacitor', unitCents: 4_799, taxable: true })];
    const o = cover(lines, { agreement: null });
    expect(o.lines.every((l) => l.reason === 'No maintenance agreement for this home, so regular prices apply.')).toBe(true);
    // 1.25 × 12 000 = 15 000; capacitor 4 799; tax 4 799 × 8.25 % = 395.9175 → 396; total 20 195.
    expect(o).toMatchObject({ subtotalCents: 19_799, savingsCents: 0, taxCents: 396, totalCents: 20_195 });
    const inv = invoiceTotals({
      lines: lines.map((l) => ({ description: l.description, kind: l.kind === 'part' ? 'parts' : 'labor', quantity: l.quantity, unitCents: l.unitCents, taxable: l.taxable })),
      taxRateBps: TAX,
    });
    expect([inv.subtotalCents, inv.taxCents, inv.totalCents]).toEqual([o.subtotalCents, o.taxCents, o.totalCents]);
  });

  it('12. the discount on parts and labor gives the same totals as the invoice rules with that discount', () => {
    // Odd amounts so every rounding step is exercised: 0.333 h × 12 000 = 3 996; 15 % = 599.4 → 599.
    const lines = [
      laborHours(0.333),
      line({ description: 'Igniter', kind: 'part', category: 'igniter', unitCents: 6_733, taxable: true }),
      line({ description: 'Flame sensor', kind: 'part', category: 'flame_sensor', unitCents: 2_911, taxable: true }),
    ];
    const o = cover(lines);
    const inv = invoiceTotals({
      lines: lines.map((l) => ({ description: l.description, kind: l.kind === 'part' ? 'parts' : 'labor', quantity: l.quantity, unitCents: l.unitCents, taxable: l.taxable })),
      discountBps: 1500,
      taxRateBps: TAX,
    });
    expect(o.lines[0]).toMatchObject({ grossCents: 3_996, savingsCents: 599 });
    expect([o.subtotalCents, o.savingsCents, o.taxCents, o.totalCents]).toEqual([inv.subtotalCents, inv.discountCents, inv.taxCents, inv.totalCents]);
    // Igniter 15 % of 6 733 = 1 009.95 → 1 010, charged 5 723; sensor 15 % of 2 911 = 436.65 → 437, charged 2 474;
    // taxable 8 197 × 8.25 % = 676.2525 → 676.
    expect(o).toMatchObject({ taxableCents: 8_197, taxCents: 676 });
  });

  it('13. outside the term no plan benefits apply, and the reason gives the last covered day (the day before the exclusive end)', () => {
    const after = cover([laborHours(1)], { visitDate: '2027-03-10' });
    expect(after.lines[0]).toMatchObject({ chargedCents: 12_000, reason: "Your agreement's term ended on March 9, 2027, so no plan benefits apply until it is renewed." });
    const before = cover([laborHours(1)], { visitDate: '2026-03-09' });
    expect(before.lines[0]!.reason).toBe('Your agreement starts on March 10, 2026, so no plan benefits apply yet.');
  });
});

describe('quotes with several options', () => {
  it('gives each option the same tune-ups left, since the homeowner approves only one', () => {
    const q = coverQuote({ agreement: agreement(), warranty: WARRANTY, visitDate: VISIT, options: [{ lines: [tuneUp()] }, { lines: [tuneUp(), laborHours(1)] }], taxRateBps: TAX });
    expect(q.options.map((o) => o.lines[0]!.chargedCents)).toEqual([0, 0]);
    expect(q.notes).toEqual(['Your Two-Season Care plan applies.', "The system's parts are under the manufacturer's warranty until March 14, 2029."]);
  });

  it('names the option and line of a bad input', () => {
    expect(
      fieldOf(() =>
        coverQuote({ agreement: agreement(), warranty: null, visitDate: VISIT, options: [{ lines: [laborHours(1)] }, { lines: [laborHours(1.0001)] }], taxRateBps: TAX }),
      ),
    ).toBe('options[1].lines[0].quantity');
  });

  it('a flat-rate task becomes its part and labor lines, grouped so the warranty rule finds its labor', () => {
    const task = { id: 'replace-blower', components: [{ ...blowerMotor(null) }, { ...laborHours(1.5) }] };
    const lines = taskLines(task, 1);
    expect(lines.map((l) => [l.category, l.quantity, l.group])).toEqual([
      ['motor', 1, 'replace-blower'],
      ['repair_labor', 1.5, 'replace-blower'],
    ]);
    const o = cover(lines, { agreement: agreement({ warrantyLaborCovered: true }), warranty: WARRANTY });
    expect(o.totalCents).toBe(0);
    // Labor outside the task's group is not labor on the warranty part: 15 % of 12 000 = 1 800 → 10 200.
    const other = cover([...lines, laborHours(1)], { warranty: WARRANTY, agreement: agreement({ warrantyLaborCovered: true }) });
    expect(other.lines[2]!.chargedCents).toBe(10_200);
  });

  it('turns an option into invoice lines whose discounts are the savings', () => {
    const o = cover([blowerMotor(), laborHours(2, 'motor-task')], { warranty: WARRANTY });
    const lines = invoiceLinesOf(o);
    expect(lines.map((l) => [l.kind, l.grossCents, l.discountCents, l.netCents])).toEqual([
      ['parts', 38_900, 38_900, 0],
      ['labor', 24_000, 3_600, 20_400],
    ]);
    expect(lines[1]!.reason).toMatch(/Repair discount 15 %/);
  });
});

describe('from the visit coverage', () => {
  it('takes the tune-ups left from the visit coverage, so a used season is charged', () => {
    const base: CoverageAgreement = {
      status: 'active',
      startsOn: '2026-03-10',
      endsOn: '2027-03-10',
      plan: { name: 'Two-Season Care', coolingVisits: 1, heatingVisits: 1, repairDiscountBps: 1000, diagnosticFeeWaived: false, priorityWindowHours: 24 },
    };
    const visit = { id: 'today', kind: 'tune_up' as const, status: 'in_progress', onDate: VISIT };
    const c = coverageFor({ agreement: base, visit, termVisits: [{ id: 'spring', kind: 'tune_up', status: 'done', onDate: '2026-04-02' }, visit], diagnosticFeeCents: 8_900 });
    const qa = quoteAgreementFrom(base, c, { warrantyLaborCovered: false, discountCategories: ['repair_labor'] });
    expect(qa.tuneUps).toEqual({ cooling: { included: 1, left: 0 }, heating: { included: 1, left: 1 } });
    const o = cover([tuneUp(), laborHours(1)], { agreement: qa });
    // Tune-up charged 12 900; labor 10 % of 12 000 = 1 200 → 10 800; total 23 700.
    expect(o.lines.map((l) => l.chargedCents)).toEqual([12_900, 10_800]);
    expect(o.totalCents).toBe(23_700);
  });
});

describe('input checks', () => {
  it('refuses lines and options over the stated maximum', () => {
    // $999,999.99 is the most for a line: 2 × 50 000 000 = 100 000 000 is over.
    expect(fieldOf(() => cover([line({ kind: 'part', category: 'compressor', unitCents: 50_000_000, quantity: 2 })]))).toBe('lines[0]');
    // Eleven lines of $999,999.99 come to $10,999,999.89, over the $9,999,999.99 for an option.
    expect(fieldOf(() => cover(Array.from({ length: 11 }, () => line({ kind: 'part', category: 'compressor', unitCents: 99_999_999 }))))).toBe('lines');
  });

  it('refuses a kind that does not match its category, a tune-up without a season, and bad plan values', () => {
    expect(fieldOf(() => cover([line({ kind: 'labor', category: 'motor', unitCents: 100 })]))).toBe('lines[0].category');
    expect(fieldOf(() => cover([line({ kind: 'fee', category: 'tune_up', unitCents: 100 })]))).toBe('lines[0].season');
    expect(fieldOf(() => cover([laborHours(1)], { agreement: agreement({ repairDiscountBps: 10_001 }) }))).toBe('agreement.repairDiscountBps');
    expect(fieldOf(() => cover([laborHours(1)], { agreement: agreement({ tuneUps: { cooling: { included: 1, left: 2 }, heating: { included: 0, left: 0 } } }) }))).toBe(
      'agreement.tuneUps.cooling.left',
    );
    expect(fieldOf(() => cover([laborHours(1)], { visitDate: '2026-02-30' }))).toBe('visitDate');
    expect(fieldOf(() => cover([line({ kind: 'labor', category: 'repair_labor', unitCents: 10.5 })]))).toBe('lines[0].unitCents');
  });

  it('says plainly why a plan is on hold', () => {
    expect(planStanding(agreement({ status: 'canceled' }), VISIT).sentence).toBe('Your agreement was canceled, so no plan benefits apply.');
    expect(planStanding(agreement({ status: 'pending' }), VISIT).covered).toBe(false);
    expect(planStanding(agreement({ status: 'renewal_due' }), VISIT).covered).toBe(true);
  });
});
