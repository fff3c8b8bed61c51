import { describe, expect, it } from 'vitest';
import {
  applyDiscountBps,
  discountCents,
  divRoundHalfUp,
  dollarsToCents,
  formatMoney,
  formatUsd,
  invoiceTotals,
  lineTotalCents,
  MAX_INVOICE_CENTS,
  MAX_LINE_CENTS,
  MoneyError,
  taxCents,
  type InvoiceLine,
} from '../shared/money';

describe('formatUsd', () => {
  // Reference: ICU's en-US currency format through Intl.NumberFormat.
  const icu = new Intl.NumberFormat('en-US', { style: 'currency', currency: 'USD' });
  it.each([0, 1, 5, 99, 100, 19_900, 123_456, 100_000_000, 987_654_321_01, -1_200, -5])('formats %i cents like ICU en-US', (cents) => {
    expect(formatUsd(cents)).toBe(icu.format(cents / 100));
  });

  it('stays exact past the point where cents / 100 as a double loses the last cent', () => {
    expect(formatUsd(9_007_199_254_740_899)).toBe('$90,071,992,547,408.99');
  });

  it('takes the lower-case currency code the card processor sends', () => {
    expect(formatMoney(123_456, 'usd')).toBe('$1,234.56');
    expect(formatMoney(-5, 'usd')).toBe('-$0.05');
  });

  it('refuses fractions of a cent and non-numbers, naming the field', () => {
    expect(() => formatUsd(10.5)).toThrow(/cents/);
    expect(() => formatUsd(Number.NaN)).toThrow(/cents/);
    expect(() => formatUsd('100' as unknown as number)).toThrow(/cents/);
  });
});

describe('divRoundHalfUp', () => {
  it('rounds halves away from zero and everything else to nearest', () => {
    expect(divRoundHalfUp(5, 2)).toBe(3); // 2.5 → 3
    expect(divRoundHalfUp(-5, 2)).toBe(-3); // -2.5 → -3 (symmetric)
    expect(divRoundHalfUp(7, 3)).toBe(2); // 2.33 → 2
    expect(divRoundHalfUp(8, 3)).toBe(3); // 2.67 → 3
    expect(divRoundHalfUp(0, 7)).toBe(0);
  });
});

describe('lineTotalCents', () => {
  it('multiplies whole quantities exactly', () => {
    expect(lineTotalCents(3, 1_250)).toBe(3_750);
    expect(lineTotalCents(0, 1_250)).toBe(0);
  });

  it('rounds fractional quantities half up to the cent', () => {
    // 1.5 h × $133.33 = $199.995 → $200.00 (half up)
    expect(lineTotalCents(1.5, 13_333)).toBe(20_000);
    // 0.1 × 3 in floating point is 0.30000000000000004; 0.3 × $10.00 must still be $3.00
    expect(lineTotalCents(0.1 * 3, 1_000)).toBe(300);
    // 2.25 h × $95.00 = $213.75 exactly
    expect(lineTotalCents(2.25, 9_500)).toBe(21_375);
  });

  it('refuses bad input with the field named', () => {
    expect(() => lineTotalCents(-1, 100)).toThrow(/quantity.*negative/);
    expect(() => lineTotalCents(1.2345, 100)).toThrow(/quantity.*3 decimals/);
    expect(() => lineTotalCents(Number.NaN, 100)).toThrow(/quantity/);
    expect(() => lineTotalCents(1, 99.5)).toThrow(/unitCents/);
    expect(() => lineTotalCents(1, -100)).toThrow(/unitCents.*negative/);
  });
});

describe('discounts', () => {
  it('takes basis points of an amount, rounding the discount half up', () => {
    // 15 % of $200.00 = $30.00
    expect(discountCents(20_000, 1_500)).toBe(3_000);
    expect(applyDiscountBps(20_000, 1_500)).toBe(17_000);
    // 15 % of $0.10 = 1.5 ¢ → 2 ¢ off, leaving 8 ¢
    expect(discountCents(10, 1_500)).toBe(2);
    expect(applyDiscountBps(10, 1_500)).toBe(8);
    // 10 % of $12.34 = 123.4 ¢ → 123 ¢
    expect(applyDiscountBps(1_234, 1_000)).toBe(1_111);
  });

  it('refuses rates outside 0–10000 bp', () => {
    expect(() => applyDiscountBps(100, 10_001)).toThrow(/discountBps/);
    expect(() => applyDiscountBps(100, 12.5)).toThrow(/discountBps/);
    expect(() => applyDiscountBps(100, -1)).toThrow(/discountBps/);
  });
});

describe('sales tax', () => {
  it('$10.05 at 8.25 % is 82.9125 ¢, which rounds to 83 ¢', () => {
    // 1005 × 825 / 10000 = 82.9125 (arithmetic); 8.25 % is Texas' top combined state + local rate (from memory)
    expect(taxCents(1_005, 825)).toBe(83);
  });

  it('an exact half cent rounds up', () => {
    // $10.00 at 8.25 % = 82.5 ¢ → 83 ¢ (half up; banker's rounding would give 82 ¢) — common practice for US sales tax
    expect(taxCents(1_000, 825)).toBe(83);
    // $0.10 at 5 % = 0.5 ¢ → 1 ¢
    expect(taxCents(10, 500)).toBe(1);
    // just under a half: $0.09 at 5 % = 0.45 ¢ → 0 ¢
    expect(taxCents(9, 500)).toBe(0);
  });

  it('refuses a rate given as a percentage fraction', () => {
    expect(() => taxCents(1_000, 8.25)).toThrow(/taxRateBps/);
  });
});

describe('invoiceTotals', () => {
  const repairInvoice: InvoiceLine[] = [
    { description: 'Capacitor 45/5 µF', kind: 'parts', quantity: 1, unitCents: 4_850, taxable: true },
    { description: 'Repair labour', kind: 'labor', quantity: 1.5, unitCents: 12_500, taxable: false },
    { description: 'Maintenance agreement, yearly', kind: 'plan_fee', quantity: 1, unitCents: 19_900, taxable: false },
    { description: 'Trip fee', kind: 'other', quantity: 1, unitCents: 7_900, taxable: false },
  ];

  it('discounts labour and parts only and taxes the taxable net', () => {
    const t = invoiceTotals({ lines: repairInvoice, discountBps: 1_500, taxRateBps: 825 });
    // parts: $48.50, 15 % off = 727.5 ¢ → 728 ¢, net 4122 ¢
    expect(t.lines[0]).toMatchObject({ grossCents: 4_850, discountCents: 728, netCents: 4_122 });
    // labour: 1.5 × $125 = $187.50, 15 % off = 2812.5 ¢ → 2813 ¢, net 15937 ¢
    expect(t.lines[1]).toMatchObject({ grossCents: 18_750, discountCents: 2_813, netCents: 15_937 });
    // the agreement fee and trip fee are never discounted
    expect(t.lines[2]).toMatchObject({ grossCents: 19_900, discountCents: 0, netCents: 19_900 });
    expect(t.lines[3]).toMatchObject({ grossCents: 7_900, discountCents: 0, netCents: 7_900 });
    expect(t.subtotalCents).toBe(4_850 + 18_750 + 19_900 + 7_900); // 51400
    expect(t.discountCents).toBe(728 + 2_813); // 3541
    // only the parts are taxable: 4122 × 8.25 % = 340.065 ¢ → 340 ¢
    expect(t.taxableCents).toBe(4_122);
    expect(t.taxCents).toBe(340);
    expect(t.totalCents).toBe(51_400 - 3_541 + 340); // 48199
  });

  it('rounds tax once on the sum of taxable lines, not per line', () => {
    const lines: InvoiceLine[] = [
      { description: 'Filter 16x25x1', kind: 'parts', quantity: 1, unitCents: 1_000, taxable: true },
      { description: 'Filter 20x25x1', kind: 'parts', quantity: 1, unitCents: 1_000, taxable: true },
    ];
    const t = invoiceTotals({ lines, taxRateBps: 825 });
    // per line would be 82.5 → 83 twice = 166 ¢; on the sum $20.00 × 8.25 % = 165 ¢ exactly
    expect(t.taxCents).toBe(165);
    expect(t.totalCents).toBe(2_165);
  });

  it('an empty invoice totals zero', () => {
    expect(invoiceTotals({ lines: [], taxRateBps: 825 })).toMatchObject({ subtotalCents: 0, taxCents: 0, totalCents: 0 });
  });

  it('names the offending line and field', () => {
    const bad = (line: Partial<InvoiceLine>) => () => invoiceTotals({ lines: [repairInvoice[0]!, { ...repairInvoice[0]!, ...line }], taxRateBps: 825 });
    expect(bad({ unitCents: 48.5 })).toThrow(/lines\[1\]\.unitCents/);
    expect(bad({ quantity: -2 })).toThrow(/lines\[1\]\.quantity/);
    expect(bad({ kind: 'refund' as never })).toThrow(/lines\[1\]\.kind/);
    expect(bad({ taxable: 'yes' as never })).toThrow(/lines\[1\]\.taxable/);
    expect(() => invoiceTotals({ lines: [], taxRateBps: -1 })).toThrow(/taxRateBps/);
    expect(() => invoiceTotals({ lines: null as never, taxRateBps: 825 })).toThrow(/lines/);
  });

  it('states a maximum per line and per invoice, and never sums past it', () => {
    const line = (unitCents: number, quantity = 1): InvoiceLine => ({ description: 'Condenser', kind: 'parts', quantity, unitCents, taxable: true });
    expect(invoiceTotals({ lines: [line(MAX_LINE_CENTS)], taxRateBps: 0 }).totalCents).toBe(MAX_LINE_CENTS);
    expect(() => invoiceTotals({ lines: [line(MAX_LINE_CENTS + 1)], taxRateBps: 0 })).toThrow(/lines\[0\]\.unitCents/);
    // 100 000 × $1,000,000.00 would be 10^13 cents: refused as a line, not stored as an overflow.
    expect(() => invoiceTotals({ lines: [line(100_000_000, 100_000)], taxRateBps: 0 })).toThrow(MoneyError);
    // Ten full lines are within the invoice maximum; tax on them takes the total past it.
    const ten = Array.from({ length: 10 }, () => line(MAX_LINE_CENTS));
    expect(invoiceTotals({ lines: ten, taxRateBps: 0 }).totalCents).toBeLessThanOrEqual(MAX_INVOICE_CENTS);
    expect(() => invoiceTotals({ lines: [...ten, line(MAX_LINE_CENTS)], taxRateBps: 0 })).toThrow(/invoice total/);
    expect(() => invoiceTotals({ lines: ten, taxRateBps: 825 })).toThrow(/invoice total/);
    // The hard limit is the integer column (PostgreSQL manual, "Numeric Types"): 2^31 − 1.
    expect(MAX_INVOICE_CENTS).toBeLessThan(2 ** 31 - 1);
  });
});

describe('dollarsToCents', () => {
  it('turns typed dollars into whole cents without floating point', () => {
    // 0.29 × 100 is 28.999… in binary floating point (IEEE 754); the parser must give 29
    expect(dollarsToCents('0.29')).toBe(29);
    expect(dollarsToCents('$1,234.5'.replace(',', ''))).toBe(123450);
    expect(dollarsToCents('  89 ')).toBe(8900);
    expect(dollarsToCents('12.345')).toBeNull();
    expect(dollarsToCents('-5')).toBeNull();
    expect(dollarsToCents('abc')).toBeNull();
  });

  it('reads every cent from 0.00 to 9.99 exactly and stops at seven dollar digits', () => {
    for (let c = 0; c < 1000; c++) {
      const text = `${Math.floor(c / 100)}.${String(c % 100).padStart(2, '0')}`;
      expect(dollarsToCents(text)).toBe(c);
    }
    expect(dollarsToCents('9999999.99')).toBe(999_999_999);
    expect(dollarsToCents('10000000')).toBeNull();
    expect(dollarsToCents('')).toBeNull();
    expect(dollarsToCents('1.')).toBeNull();
  });
});
