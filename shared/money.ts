// Money is integer cents (USD) everywhere. Rates are integer basis points
// (1 bp = 0.01 %, so 825 bp = 8.25 %). No floating-point amounts leave this file.

/**
 * Stated maxima. The cents columns are PostgreSQL `integer` (at most 2^31 − 1 = 2,147,483,647,
 * PostgreSQL manual "Numeric Types"); an invoice total, tax included, stays well below it.
 */
export const MAX_LINE_CENTS = 99_999_999; // $999,999.99 a line
export const MAX_INVOICE_CENTS = 999_999_999; // $9,999,999.99 an invoice
export const MAX_INVOICE_LINES = 100;

export class MoneyError extends Error {
  constructor(
    readonly field: string,
    message: string,
  ) {
    super(`${field}: ${message}`);
    this.name = 'MoneyError';
  }
}

/** Throws unless `value` is a safe integer number of cents (negative allowed only if `allowNegative`). */
export function assertCents(value: unknown, field: string, allowNegative = false): asserts value is number {
  if (typeof value !== 'number' || !Number.isSafeInteger(value)) {
    throw new MoneyError(field, `must be a whole number of cents, got ${String(value)}`);
  }
  if (!allowNegative && value < 0) {
    throw new MoneyError(field, `must not be negative, got ${value}`);
  }
}

/** Throws unless `value` is an integer basis-point rate between 0 and 10 000 (0–100 %). */
export function assertBps(value: unknown, field: string): asserts value is number {
  if (typeof value !== 'number' || !Number.isInteger(value) || value < 0 || value > 10_000) {
    throw new MoneyError(field, `must be whole basis points from 0 to 10000, got ${String(value)}`);
  }
}

/**
 * Divides integers and rounds half up (half away from zero for negatives),
 * exactly, with BigInt so large products never lose precision.
 */
export function divRoundHalfUp(numerator: number | bigint, denominator: number | bigint): number {
  const n = BigInt(numerator);
  const d = BigInt(denominator);
  if (d === 0n) throw new MoneyError('denominator', 'must not be zero');
  const negative = n < 0n !== d < 0n && n !== 0n;
  const an = n < 0n ? -n : n;
  const ad = d < 0n ? -d : d;
  const q = (2n * an + ad) / (2n * ad);
  const result = Number(negative ? -q : q);
  if (!Number.isSafeInteger(result)) throw new MoneyError('amount', 'is too large');
  return result;
}

const moneyFormats = new Map<string, Intl.NumberFormat>();

/**
 * Cents (two decimal places, as every currency the product and its fakes use) in the currency's
 * en-US form ("$1,234.56", "-$12.00"), by ICU through `Intl.NumberFormat`. Every amount put into
 * words on the server (mail, receipts, messages) goes through here.
 */
export function formatMoney(cents: number, currency = 'USD'): string {
  assertCents(cents, 'cents', true);
  const code = currency.toUpperCase();
  let format = moneyFormats.get(code);
  if (!format) {
    format = new Intl.NumberFormat('en-US', { style: 'currency', currency: code });
    moneyFormats.set(code, format);
  }
  // Handed over as a decimal string, which Intl formats exactly (ECMA-402, Intl.NumberFormat
  // v3); cents / 100 as a double can be a cent off past about $35 trillion (2^45 dollars).
  const digits = String(Math.abs(cents)).padStart(3, '0');
  const decimal = `${cents < 0 ? '-' : ''}${digits.slice(0, -2)}.${digits.slice(-2)}` as `${number}`;
  return format.format(decimal);
}

/** US dollars, as everywhere in the product. */
export const formatUsd = (cents: number): string => formatMoney(cents, 'USD');

// Quantities (hours of labour, feet of line set) allow up to 3 decimals so the
// product with a cent price is computed exactly in thousandths.
const QTY_SCALE = 1000;

function scaledQuantity(qty: unknown, field: string): number {
  if (typeof qty !== 'number' || !Number.isFinite(qty)) {
    throw new MoneyError(field, `must be a number, got ${String(qty)}`);
  }
  if (qty < 0) throw new MoneyError(field, `must not be negative, got ${qty}`);
  const scaled = Math.round(qty * QTY_SCALE);
  if (Math.abs(scaled - qty * QTY_SCALE) > 1e-6) {
    throw new MoneyError(field, `allows at most 3 decimals, got ${qty}`);
  }
  return scaled;
}

/** qty × unit price, rounded half up to the cent (only fractional quantities can round). */
export function lineTotalCents(qty: number, unitCents: number): number {
  const scaled = scaledQuantity(qty, 'quantity');
  assertCents(unitCents, 'unitCents');
  return divRoundHalfUp(BigInt(scaled) * BigInt(unitCents), QTY_SCALE);
}

/** The discount itself: cents × bps / 10 000, rounded half up to the cent. */
export function discountCents(cents: number, bps: number): number {
  assertCents(cents, 'cents');
  assertBps(bps, 'discountBps');
  return divRoundHalfUp(BigInt(cents) * BigInt(bps), 10_000);
}

/** The amount after a discount of `bps` basis points (the discount rounded half up). */
export function applyDiscountBps(cents: number, bps: number): number {
  return cents - discountCents(cents, bps);
}

/** Sales tax on an amount: cents × rate / 10 000, rounded half up to the cent. */
export function taxCents(taxableCents: number, rateBps: number): number {
  assertCents(taxableCents, 'taxableCents');
  assertBps(rateBps, 'taxRateBps');
  return divRoundHalfUp(BigInt(taxableCents) * BigInt(rateBps), 10_000);
}

/**
 * What a line is. The plan discount applies to repair labour and parts only:
 * the agreement fee itself and other charges (trip fee, permit) are never
 * discounted.
 */
export type InvoiceLineKind = 'labor' | 'parts' | 'plan_fee' | 'other';
export const DISCOUNTABLE_KINDS: readonly InvoiceLineKind[] = ['labor', 'parts'];
const LINE_KINDS: readonly InvoiceLineKind[] = ['labor', 'parts', 'plan_fee', 'other'];

export interface InvoiceLine {
  description: string;
  kind: InvoiceLineKind;
  quantity: number;
  unitCents: number;
  taxable: boolean;
}

export interface InvoiceLineTotal extends InvoiceLine {
  grossCents: number;
  discountCents: number;
  netCents: number;
}

export interface InvoiceTotals {
  lines: InvoiceLineTotal[];
  subtotalCents: number;
  discountCents: number;
  taxableCents: number;
  taxCents: number;
  totalCents: number;
}

/**
 * Invoice totals. Rounding rule:
 * 1. each line's gross = quantity × unit price, rounded half up to the cent;
 * 2. the plan discount is taken per discountable line, rounded half up to the cent;
 * 3. sales tax is computed once, on the sum of the taxable lines' net amounts,
 *    and rounded half up to the cent on the invoice total (not line by line).
 */
export function invoiceTotals(input: { lines: InvoiceLine[]; discountBps?: number; taxRateBps: number }): InvoiceTotals {
  if (!input || !Array.isArray(input.lines)) throw new MoneyError('lines', 'must be a list of invoice lines');
  if (input.lines.length > MAX_INVOICE_LINES) throw new MoneyError('lines', `must be at most ${MAX_INVOICE_LINES} lines`);
  const discountBps = input.discountBps ?? 0;
  assertBps(discountBps, 'discountBps');
  assertBps(input.taxRateBps, 'taxRateBps');

  const lines = input.lines.map((line, i): InvoiceLineTotal => {
    const at = `lines[${i}]`;
    if (!line || typeof line !== 'object') throw new MoneyError(at, 'must be an invoice line');
    if (!LINE_KINDS.includes(line.kind)) {
      throw new MoneyError(`${at}.kind`, `must be one of ${LINE_KINDS.join(', ')}, got ${String(line.kind)}`);
    }
    if (typeof line.taxable !== 'boolean') throw new MoneyError(`${at}.taxable`, 'must be true or false');
    const scaled = scaledQuantity(line.quantity, `${at}.quantity`);
    assertCents(line.unitCents, `${at}.unitCents`);
    const grossCents = divRoundHalfUp(BigInt(scaled) * BigInt(line.unitCents), QTY_SCALE);
    if (grossCents > MAX_LINE_CENTS) throw new MoneyError(`${at}.unitCents`, `the line total must be at most ${formatUsd(MAX_LINE_CENTS)}`);
    const lineDiscount = DISCOUNTABLE_KINDS.includes(line.kind) ? discountCents(grossCents, discountBps) : 0;
    return { ...line, grossCents, discountCents: lineDiscount, netCents: grossCents - lineDiscount };
  });

  const subtotalCents = lines.reduce((s, l) => s + l.grossCents, 0);
  const totalDiscount = lines.reduce((s, l) => s + l.discountCents, 0);
  const taxableCents = lines.filter((l) => l.taxable).reduce((s, l) => s + l.netCents, 0);
  const tax = taxCents(taxableCents, input.taxRateBps);
  // Each line is at most MAX_LINE_CENTS and there are at most MAX_INVOICE_LINES, so these sums
  // stay far inside Number.MAX_SAFE_INTEGER; only the total needs its own bound.
  const totalCents = subtotalCents - totalDiscount + tax;
  if (totalCents > MAX_INVOICE_CENTS) throw new MoneyError('lines', `the invoice total must be at most ${formatUsd(MAX_INVOICE_CENTS)}`);
  return {
    lines,
    subtotalCents,
    discountCents: totalDiscount,
    taxableCents,
    taxCents: tax,
    totalCents,
  };
}

/**
 * Dollars as typed ("12.50", "$89", " 0.29 ") to integer cents, read digit by digit so no
 * floating-point product is ever formed (0.29 × 100 is 28.999… in IEEE 754). Null when the text
 * is not an amount: negative, more than two decimals, or over $9,999,999.99.
 */
export function dollarsToCents(text: string): number | null {
  const m = /^\s*\$?(\d{1,7})(?:\.(\d{1,2}))?\s*$/.exec(text);
  if (!m) return null;
  return Number(m[1]) * 100 + Number((m[2] ?? '0').padEnd(2, '0'));
}
