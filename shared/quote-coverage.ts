// What the household pays on each quote or invoice line, and why, in one plain sentence. Pure:
// the server gathers the agreement, the system's warranty and the priced lines; this decides.
// Rounding is the invoices' own (shared/money.ts): each line's gross is rounded half up to the
// cent, a discount is taken per line and rounded half up, and sales tax is computed once on the
// sum of the taxable lines' charged amounts.
import { formatTermDay, termLastDay } from './agreement-terms';
import { AGREEMENT_STATUSES, type AgreementStatus } from './agreements';
import { COVERING_STATUSES, CoverageInputError, TUNE_UP_SEASONS, type Coverage, type CoverageAgreement, type TuneUpSeason } from './coverage';
import { assertBps, discountCents, formatUsd, lineTotalCents, MoneyError, taxCents, type InvoiceLineKind } from './money';
import { ITEM_CATEGORIES, ITEM_CATEGORY_KIND, ITEM_KINDS, LINE_MAX_CENTS, QUOTE_MAX_CENTS, WARRANTY_PART_CATEGORIES, type ItemCategory, type ItemKind } from './pricebook';
import type { CoverageRuleName } from './schemas/pricebook';
import { isCalendarDate, warrantyStatus } from './service-life';

/** The agreement as the quote sees it: its standing and the plan's benefits. */
export interface QuoteAgreement {
  status: AgreementStatus;
  /** First covered day, local ISO date. */
  startsOn: string;
  /** The day the term ends (not covered), local ISO date. */
  endsOn: string;
  planName: string;
  repairDiscountBps: number;
  diagnosticFeeWaived: boolean;
  /** Does the plan pay the labor to fit a part the manufacturer's warranty replaces? */
  warrantyLaborCovered: boolean;
  /** Tune-ups the plan includes per season, and how many are left this season before this visit. */
  tuneUps: Record<TuneUpSeason, { included: number; left: number }>;
  /** Categories the owner marked as taking the repair discount. */
  discountCategories: readonly ItemCategory[];
}

export interface EquipmentWarranty {
  /** Last day of the manufacturer's parts warranty (inclusive), local ISO date; null when not recorded. */
  partsEndsOn: string | null;
}

export interface CoverageLineInput {
  description: string;
  kind: ItemKind;
  category: ItemCategory;
  quantity: number;
  unitCents: number;
  taxable: boolean;
  /** Lines of one flat-rate task share a group: its labor is the labor to fit its parts. */
  group?: string | null;
  /** A tune-up line's season (the visit's), so it counts against that season's allowance. */
  season?: TuneUpSeason | null;
}

export interface CoveredLine extends CoverageLineInput {
  grossCents: number;
  savingsCents: number;
  chargedCents: number;
  rules: CoverageRuleName[];
  reason: string;
}

export interface OptionCoverage {
  lines: CoveredLine[];
  subtotalCents: number;
  savingsCents: number;
  taxableCents: number;
  taxCents: number;
  totalCents: number;
}

const pct = (bps: number) => `${(bps / 100).toFixed(bps % 100 === 0 ? 0 : 2)} %`;
const minus = (cents: number) => `−${formatUsd(cents)}`;

function isoDate(value: unknown, field: string): string {
  if (typeof value !== 'string' || !/^\d{4}-\d{2}-\d{2}$/.test(value) || !isCalendarDate(value))
    throw new CoverageInputError(field, `must be a date as YYYY-MM-DD, got ${String(value)}`);
  return value;
}

function checkAgreement(a: QuoteAgreement): QuoteAgreement {
  if (!a || typeof a !== 'object') throw new CoverageInputError('agreement', 'must be the agreement or null');
  if (!AGREEMENT_STATUSES.includes(a.status)) throw new CoverageInputError('agreement.status', `must be one of ${AGREEMENT_STATUSES.join(', ')}, got ${String(a.status)}`);
  isoDate(a.startsOn, 'agreement.startsOn');
  isoDate(a.endsOn, 'agreement.endsOn');
  if (a.endsOn <= a.startsOn) throw new CoverageInputError('agreement.endsOn', 'must be after the start of the term');
  try {
    assertBps(a.repairDiscountBps, 'agreement.repairDiscountBps');
  } catch (err) {
    throw new CoverageInputError('agreement.repairDiscountBps', (err as Error).message.replace(/^[^:]+: /, ''));
  }
  if (typeof a.diagnosticFeeWaived !== 'boolean') throw new CoverageInputError('agreement.diagnosticFeeWaived', 'must be true or false');
  if (typeof a.warrantyLaborCovered !== 'boolean') throw new CoverageInputError('agreement.warrantyLaborCovered', 'must be true or false');
  for (const s of TUNE_UP_SEASONS) {
    const t = a.tuneUps?.[s];
    for (const k of ['included', 'left'] as const) {
      const v = t?.[k];
      if (typeof v !== 'number' || !Number.isInteger(v) || v < 0 || v > 52)
        throw new CoverageInputError(`agreement.tuneUps.${s}.${k}`, `must be a whole number from 0 to 52, got ${String(v)}`);
    }
    if (t!.left > t!.included) throw new CoverageInputError(`agreement.tuneUps.${s}.left`, 'must not be more than the tune-ups included');
  }
  if (!Array.isArray(a.discountCategories) || a.discountCategories.some((c) => !ITEM_CATEGORIES.includes(c)))
    throw new CoverageInputError('agreement.discountCategories', 'must be a list of price-book categories');
  return a;
}

/**
 * Whether the plan's benefits apply on the visit date, and if not, the sentence that says why
 * (lines that the plan would have covered carry it as their reason).
 */
export function planStanding(agreement: QuoteAgreement | null, visitDate: string): { covered: boolean; sentence: string } {
  isoDate(visitDate, 'visitDate');
  if (!agreement) return { covered: false, sentence: 'No maintenance agreement for this home, so regular prices apply.' };
  const a = checkAgreement(agreement);
  switch (a.status) {
    case 'past_due':
      return { covered: false, sentence: 'Your agreement is past due, so no plan benefits apply until it is paid.' };
    case 'lapsed':
      return { covered: false, sentence: 'Your agreement has lapsed, so no plan benefits apply until it is renewed.' };
    case 'canceled':
      return { covered: false, sentence: 'Your agreement was canceled, so no plan benefits apply.' };
    case 'pending':
      return { covered: false, sentence: 'Your agreement starts once its first payment is made, so no plan benefits apply yet.' };
  }
  if (visitDate < a.startsOn) return { covered: false, sentence: `Your agreement starts on ${formatTermDay(a.startsOn)}, so no plan benefits apply yet.` };
  if (visitDate >= a.endsOn) return { covered: false, sentence: `Your agreement's term ended on ${formatTermDay(termLastDay(a))}, so no plan benefits apply until it is renewed.` };
  if (!COVERING_STATUSES.includes(a.status)) return { covered: false, sentence: 'Your agreement is on hold, so no plan benefits apply.' };
  return { covered: true, sentence: `Your ${a.planName} plan applies.` };
}

/** The manufacturer's parts warranty on the visit date: the same inclusive end day the equipment page uses. */
function warrantyEndOn(warranty: EquipmentWarranty | null, visitDate: string): string | null {
  if (!warranty || warranty.partsEndsOn === null || warranty.partsEndsOn === undefined) return null;
  const end = isoDate(warranty.partsEndsOn, 'warranty.partsEndsOn');
  const s = warrantyStatus(end, visitDate);
  return s === 'active' || s === 'ending_soon' ? end : null;
}

function checkLine(l: CoverageLineInput, at: string): number {
  if (!l || typeof l !== 'object') throw new CoverageInputError(at, 'must be a quote line');
  if (typeof l.description !== 'string') throw new CoverageInputError(`${at}.description`, 'must be text');
  if (!ITEM_KINDS.includes(l.kind)) throw new CoverageInputError(`${at}.kind`, `must be one of ${ITEM_KINDS.join(', ')}, got ${String(l.kind)}`);
  if (!ITEM_CATEGORIES.includes(l.category)) throw new CoverageInputError(`${at}.category`, `is not a price-book category: ${String(l.category)}`);
  if (ITEM_CATEGORY_KIND[l.category] !== l.kind) throw new CoverageInputError(`${at}.category`, `${l.category} is not a ${l.kind} category`);
  if (typeof l.taxable !== 'boolean') throw new CoverageInputError(`${at}.taxable`, 'must be true or false');
  let gross: number;
  try {
    gross = lineTotalCents(l.quantity, l.unitCents);
  } catch (err) {
    if (!(err instanceof MoneyError)) throw err;
    throw new CoverageInputError(`${at}.${err.field === 'quantity' ? 'quantity' : 'unitCents'}`, err.message.replace(/^[^:]+: /, ''));
  }
  if (gross > LINE_MAX_CENTS) throw new CoverageInputError(at, `comes to ${formatUsd(gross)}; a line can be at most ${formatUsd(LINE_MAX_CENTS)}`);
  if (l.category === 'tune_up') {
    if (l.season !== 'cooling' && l.season !== 'heating') throw new CoverageInputError(`${at}.season`, 'must be cooling or heating for a tune-up');
    if (!Number.isInteger(l.quantity)) throw new CoverageInputError(`${at}.quantity`, 'counts whole tune-ups');
  }
  return gross;
}

/**
 * Each line's charge and reason for one option, and the option's totals. Options are
 * alternatives, so each starts from the same tune-ups left.
 */
export function coverOption(input: {
  agreement: QuoteAgreement | null;
  warranty: EquipmentWarranty | null;
  /** Local ISO date of the visit the work is done on. */
  visitDate: string;
  lines: CoverageLineInput[];
  taxRateBps: number;
}): OptionCoverage {
  if (!input || typeof input !== 'object') throw new CoverageInputError('input', 'must be an object');
  const standing = planStanding(input.agreement, input.visitDate);
  const a = standing.covered ? input.agreement! : null;
  try {
    assertBps(input.taxRateBps, 'taxRateBps');
  } catch (err) {
    throw new CoverageInputError('taxRateBps', (err as Error).message.replace(/^[^:]+: /, ''));
  }
  if (!Array.isArray(input.lines)) throw new CoverageInputError('lines', 'must be a list of quote lines');
  const grosses = input.lines.map((l, i) => checkLine(l, `lines[${i}]`));
  const warrantyEnd = warrantyEndOn(input.warranty, input.visitDate);
  const isWarrantyPart = (l: CoverageLineInput) => warrantyEnd !== null && l.kind === 'part' && WARRANTY_PART_CATEGORIES.includes(l.category);
  const warrantyGroups = new Set(input.lines.filter((l) => isWarrantyPart(l) && l.group).map((l) => l.group!));
  const left: Record<TuneUpSeason, number> = { cooling: a?.tuneUps.cooling.left ?? 0, heating: a?.tuneUps.heating.left ?? 0 };

  const lines = input.lines.map((l, i): CoveredLine => {
    const gross = grosses[i]!;
    const done = (savings: number, rules: CoverageRuleName[], sentences: string[]): CoveredLine => ({
      ...l,
      grossCents: gross,
      savingsCents: savings,
      chargedCents: gross - savings,
      rules: rules.length ? rules : ['regular'],
      reason: sentences.join(' '),
    });

    // The manufacturer replaces the part whatever the agreement's standing.
    if (isWarrantyPart(l)) {
      const labor = a?.warrantyLaborCovered ? 'your plan covers the labor to fit it' : 'labor is charged';
      return done(gross, ['warranty_part'], [`Part under the manufacturer's warranty until ${formatTermDay(warrantyEnd!)}: no charge; ${labor}.`]);
    }
    const fitsWarrantyPart = l.kind === 'labor' && !!l.group && warrantyGroups.has(l.group);
    if (fitsWarrantyPart && a?.warrantyLaborCovered) {
      return done(gross, ['warranty_labor'], ["Labor to fit a part under the manufacturer's warranty: included in your plan."]);
    }
    const sentences: string[] = fitsWarrantyPart ? ["Labor to fit a part under the manufacturer's warranty is charged."] : [];
    if (!a) return done(0, [], [...sentences, standing.sentence]);

    let savings = 0;
    const rules: CoverageRuleName[] = [];
    if (l.category === 'tune_up') {
      const season = l.season!;
      const { included } = a.tuneUps[season];
      const free = Math.min(l.quantity, left[season]);
      if (free > 0) {
        sentences.push(`Tune-up included in your plan: ${left[season]} of ${included} ${season} tune-ups left this season.`);
        if (free < l.quantity) sentences.push(`The other ${l.quantity - free} ${l.quantity - free === 1 ? 'is' : 'are'} charged.`);
        left[season] -= free;
        savings = lineTotalCents(free, l.unitCents);
        rules.push('tune_up_included');
      } else {
        sentences.push(
          included === 0
            ? `Your plan includes no ${season} tune-ups: regular price.`
            : `No ${season} tune-ups left in your plan this season (${included} of ${included} used): regular price.`,
        );
      }
    } else if (l.category === 'diagnostic_fee') {
      if (a.diagnosticFeeWaived) {
        savings = gross;
        rules.push('diagnostic_waived');
        sentences.push('Diagnostic fee waived by your plan: no charge.');
      } else {
        sentences.push('Your plan does not waive the diagnostic fee.');
      }
    }
    const rest = gross - savings;
    if (rest > 0 && a.repairDiscountBps > 0 && a.discountCategories.includes(l.category)) {
      const d = discountCents(rest, a.repairDiscountBps);
      savings += d;
      rules.push('repair_discount');
      sentences.push(`Repair discount ${pct(a.repairDiscountBps)}: ${minus(d)}.`);
    } else if (!sentences.length) {
      sentences.push(a.repairDiscountBps > 0 ? "Not part of your plan's repair discount: regular price." : 'Regular price.');
    }
    return done(savings, rules, sentences);
  });

  const subtotalCents = lines.reduce((s, l) => s + l.grossCents, 0);
  if (subtotalCents > QUOTE_MAX_CENTS) throw new CoverageInputError('lines', `come to ${formatUsd(subtotalCents)}; an option can be at most ${formatUsd(QUOTE_MAX_CENTS)}`);
  const savingsCents = lines.reduce((s, l) => s + l.savingsCents, 0);
  const taxableCents = lines.filter((l) => l.taxable).reduce((s, l) => s + l.chargedCents, 0);
  const tax = taxCents(taxableCents, input.taxRateBps);
  const totalCents = subtotalCents - savingsCents + tax;
  if (totalCents > QUOTE_MAX_CENTS) throw new CoverageInputError('lines', `come to ${formatUsd(totalCents)} with tax; an option can be at most ${formatUsd(QUOTE_MAX_CENTS)}`);
  return { lines, subtotalCents, savingsCents, taxableCents, taxCents: tax, totalCents };
}

/** Every option of a quote, and the banner's plain sentences about the plan and the warranty. */
export function coverQuote(input: {
  agreement: QuoteAgreement | null;
  warranty: EquipmentWarranty | null;
  visitDate: string;
  options: { lines: CoverageLineInput[] }[];
  taxRateBps: number;
}): { options: OptionCoverage[]; notes: string[] } {
  if (!input || !Array.isArray(input.options)) throw new CoverageInputError('options', 'must be a list of options');
  const options = input.options.map((o, i) => {
    try {
      return coverOption({ agreement: input.agreement, warranty: input.warranty, visitDate: input.visitDate, lines: o?.lines, taxRateBps: input.taxRateBps });
    } catch (err) {
      if (err instanceof CoverageInputError && (err.field === 'lines' || err.field.startsWith('lines[')))
        throw new CoverageInputError(`options[${i}].${err.field}`, err.message.replace(/^[^:]+: /, ''));
      throw err;
    }
  });
  const standing = planStanding(input.agreement, input.visitDate);
  const notes = [standing.sentence];
  const end = warrantyEndOn(input.warranty, input.visitDate);
  if (end) notes.push(`The system's parts are under the manufacturer's warranty until ${formatTermDay(end)}.`);
  else if (input.warranty?.partsEndsOn) notes.push(`The system's manufacturer's parts warranty ended on ${formatTermDay(input.warranty.partsEndsOn)}.`);
  return { options, notes };
}

/**
 * The quote's view of an agreement, from the visit's coverage (coverageFor) and the plan terms it
 * was built from, plus the two choices the visit coverage does not carry.
 */
export function quoteAgreementFrom(
  agreement: CoverageAgreement,
  coverage: Coverage,
  extra: { warrantyLaborCovered: boolean; discountCategories: readonly ItemCategory[] },
): QuoteAgreement {
  const of = (s: TuneUpSeason) => {
    const x = coverage.allowances.find((al) => al.season === s);
    return { included: x?.included ?? 0, left: x?.left ?? 0 };
  };
  return {
    status: agreement.status,
    startsOn: agreement.startsOn,
    endsOn: agreement.endsOn,
    planName: agreement.plan.name,
    repairDiscountBps: agreement.plan.repairDiscountBps,
    diagnosticFeeWaived: agreement.plan.diagnosticFeeWaived,
    warrantyLaborCovered: extra.warrantyLaborCovered,
    tuneUps: { cooling: of('cooling'), heating: of('heating') },
    discountCategories: extra.discountCategories,
  };
}

/** A flat-rate task done `times` times, as its part and labor lines grouped under the task. */
export function taskLines(task: { id: string; components: Omit<CoverageLineInput, 'group'>[] }, times: number): CoverageLineInput[] {
  if (!Number.isInteger(times) || times < 1) throw new CoverageInputError('times', `must be a whole number of at least 1, got ${String(times)}`);
  return task.components.map((c) => ({ ...c, quantity: Math.round(c.quantity * times * 1000) / 1000, group: task.id }));
}

const INVOICE_KIND: Record<ItemKind, InvoiceLineKind> = { part: 'parts', labor: 'labor', fee: 'other' };

/**
 * An option's lines as invoice lines: the savings are the line's discount, so the invoice
 * shows the coverage line by line and adds up to the same total.
 */
export function invoiceLinesOf(option: OptionCoverage): {
  description: string;
  kind: InvoiceLineKind;
  quantity: number;
  unitCents: number;
  taxable: boolean;
  grossCents: number;
  discountCents: number;
  netCents: number;
  reason: string;
}[] {
  return option.lines.map((l) => ({
    description: l.description,
    kind: INVOICE_KIND[l.kind],
    quantity: l.quantity,
    unitCents: l.unitCents,
    taxable: l.taxable,
    grossCents: l.grossCents,
    discountCents: l.savingsCents,
    netCents: l.chargedCents,
    reason: l.reason,
  }));
}
