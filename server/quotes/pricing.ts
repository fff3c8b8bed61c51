import { eq, inArray } from 'drizzle-orm';
import { CoverageInputError, tuneUpSeasonOf, type Coverage } from '../../shared/coverage';
import { coverQuote, taskLines, type CoverageLineInput, type OptionCoverage, type QuoteAgreement } from '../../shared/quote-coverage';
import type { QuoteLineInput, QuoteOptionInput } from '../../shared/schemas/pricebook';
import type { Db, Tx } from '../db/client';
import { equipment, priceBookItems, stockLocations } from '../db/schema';
import { companyInfo, visitCoverageAndPlan, type CompanyInfo, type QuotePlanChoices } from '../field/visit-data';
import { localDate } from '../company/company';
import { AppError } from '../http/errors';
import { taskViews } from '../pricebook/pricebook.service';
import type { VisitRow } from '../visits/visit-status';

// Turns quote lines as sent (price-book items, flat-rate tasks, written-out lines) into priced
// lines with today's item versions, then works out each line's coverage for the visit.

/** A priced line with what the quote keeps beside the coverage. */
export interface PricedLine extends CoverageLineInput {
  itemId: string | null;
  itemVersionId: string | null;
  taskId: string | null;
  sku: string | null;
  stockLocationId: string | null;
  equipmentId: string | null;
}

export interface CoverageContext {
  info: CompanyInfo;
  /** The home the work is at: every system a line names must be there. */
  propertyId: string;
  visitDate: string;
  coverage: Coverage;
  agreement: QuoteAgreement | null;
  warranty: { partsEndsOn: string | null } | null;
  taxRateBps: number;
}

/** The quote's view of the visit's agreement, with the plan version's discount categories and warranty-labor choice. */
export function quoteAgreementOf(c: Coverage, plan: QuotePlanChoices | null): QuoteAgreement | null {
  if (!c.hasAgreement || !c.status || !c.term || !plan) return null;
  const of = (s: 'cooling' | 'heating') => {
    const a = c.allowances.find((x) => x.season === s);
    return { included: a?.included ?? 0, left: Math.min(a?.left ?? 0, a?.included ?? 0) };
  };
  return {
    status: c.status,
    startsOn: c.term.startsOn,
    endsOn: c.term.endsOn,
    planName: c.planName ?? 'Maintenance plan',
    repairDiscountBps: c.repairDiscountBps,
    diagnosticFeeWaived: c.diagnosticFee.waived,
    warrantyLaborCovered: plan.warrantyLaborCovered,
    tuneUps: { cooling: of('cooling'), heating: of('heating') },
    discountCategories: plan.discountCategories,
  };
}

export async function coverageContext(db: Db | Tx, visit: VisitRow, equipmentId: string | null, taxRateBps: number): Promise<CoverageContext> {
  const info = await companyInfo(db);
  const { coverage, plan } = await visitCoverageAndPlan(db, visit, info);
  let warranty: CoverageContext['warranty'] = null;
  if (equipmentId) {
    const [e] = await db.select({ propertyId: equipment.propertyId, warrantyEndsOn: equipment.warrantyEndsOn }).from(equipment).where(eq(equipment.id, equipmentId));
    if (!e || e.propertyId !== visit.propertyId) throw new AppError(422, 'validation_failed', 'Please check equipmentId.', { equipmentId: 'Choose a system at this home.' });
    warranty = { partsEndsOn: e.warrantyEndsOn };
  }
  return { info, propertyId: visit.propertyId, visitDate: localDate(visit.startsAt, info.timeZone), coverage, agreement: quoteAgreementOf(coverage, plan), warranty, taxRateBps };
}

/** One 422 naming every field in `fields`, in the usual shape. */
export const invalidFields = (fields: Record<string, string>) => new AppError(422, 'validation_failed', `Please check ${Object.keys(fields).join(', ')}.`, fields);
const bad = (field: string, message: string) => invalidFields({ [field]: message });

/**
 * Runs the pure coverage code. Its input errors (CoverageInputError) are the one kind that
 * becomes a 422, naming the field as the request does ("lines[1].quantity" is "lines.1.quantity");
 * anything else it throws passes on unchanged, keeping its own status (or a 500).
 */
export function coverageOf<T>(work: () => T): T {
  try {
    return work();
  } catch (err) {
    if (err instanceof CoverageInputError) throw bad(err.field.replace(/\[(\d+)\]/g, '.$1'), err.message.replace(/^[^:]+: /, ''));
    throw err;
  }
}

/** Prices lines; `path` names the option in field errors ("options.0"), or is empty when the lines are the body's own. */
export async function priceLines(db: Db | Tx, lines: QuoteLineInput[], ctx: CoverageContext, path: string): Promise<PricedLine[]> {
  const prefix = path ? `${path}.lines` : 'lines';
  const itemIds = lines.flatMap((l) => (l.source === 'item' ? [l.itemId] : []));
  const taskIds = lines.flatMap((l) => (l.source === 'task' ? [l.taskId] : []));
  const locIds = lines.flatMap((l) => (l.source !== 'custom' && l.stockLocationId ? [l.stockLocationId] : []));
  const items = itemIds.length ? await db.select().from(priceBookItems).where(inArray(priceBookItems.id, itemIds)) : [];
  const tasks = taskIds.length ? await taskViews(db, taskIds) : [];
  const locs = locIds.length ? await db.select({ id: stockLocations.id }).from(stockLocations).where(inArray(stockLocations.id, locIds)) : [];
  const unitIds = [...new Set(lines.flatMap((l) => (l.equipmentId ? [l.equipmentId] : [])))];
  const units = unitIds.length ? await db.select({ id: equipment.id, propertyId: equipment.propertyId }).from(equipment).where(inArray(equipment.id, unitIds)) : [];
  const here = new Set(units.filter((u) => u.propertyId === ctx.propertyId).map((u) => u.id));
  // A line's system is one at the home the work is at: another household's (or a made-up id) is refused.
  const elsewhere = lines.flatMap((l, i) => (l.equipmentId && !here.has(l.equipmentId) ? [[`${prefix}.${i}.equipmentId`, 'Choose a system at this home.'] as const] : []));
  if (elsewhere.length) throw invalidFields(Object.fromEntries(elsewhere));
  const season = ctx.coverage.tuneUpSeason ?? tuneUpSeasonOf(ctx.visitDate, ctx.info.seasons);
  const out: PricedLine[] = [];
  lines.forEach((l, i) => {
    const at = `${prefix}.${i}`;
    const equipmentId = l.equipmentId ?? null;
    const stockLocationId = l.source !== 'custom' ? (l.stockLocationId ?? null) : null;
    if (stockLocationId && !locs.some((x) => x.id === stockLocationId)) throw bad(`${at}.stockLocationId`, 'That truck or shop was not found.');
    if (l.source === 'item') {
      const it = items.find((x) => x.id === l.itemId);
      if (!it || !it.active) throw bad(`${at}.itemId`, it ? 'That item is no longer offered.' : 'That price-book item was not found.');
      if (stockLocationId && it.kind !== 'part') throw bad(`${at}.stockLocationId`, 'Only parts come from a truck or the shop.');
      out.push({
        description: it.name,
        kind: it.kind,
        category: it.category,
        quantity: l.quantity,
        unitCents: it.unitCents,
        taxable: it.taxable,
        group: null,
        season: it.category === 'tune_up' ? season : null,
        itemId: it.id,
        itemVersionId: it.currentVersionId,
        taskId: null,
        sku: it.sku,
        stockLocationId,
        equipmentId,
      });
    } else if (l.source === 'task') {
      const t = tasks.find((x) => x.id === l.taskId);
      if (!t || !t.active) throw bad(`${at}.taskId`, t ? 'That task is no longer offered.' : 'That flat-rate task was not found.');
      const group = `${t.id}:${i}`;
      const parts = taskLines(
        {
          id: group,
          components: t.components.map((c) => ({
            description: `${t.name}: ${c.name}`,
            kind: c.kind,
            category: c.category,
            quantity: c.quantity,
            unitCents: c.unitCents,
            taxable: c.taxable,
          })),
        },
        l.quantity,
      );
      parts.forEach((p, k) => {
        const c = t.components[k]!;
        out.push({
          ...p,
          season: c.category === 'tune_up' ? season : null,
          itemId: c.itemId,
          itemVersionId: c.itemVersionId,
          taskId: t.id,
          sku: c.sku,
          stockLocationId: c.kind === 'part' ? stockLocationId : null,
          equipmentId,
        });
      });
    } else {
      out.push({
        description: l.description,
        kind: l.kind,
        category: l.category,
        quantity: l.quantity,
        unitCents: l.unitCents,
        taxable: l.taxable,
        group: null,
        season: l.category === 'tune_up' ? season : null,
        itemId: null,
        itemVersionId: null,
        taskId: null,
        sku: null,
        stockLocationId: null,
        equipmentId,
      });
    }
  });
  return out;
}

export interface PricedOption {
  title: string;
  description: string;
  lines: PricedLine[];
  coverage: OptionCoverage;
}

/** Every option priced and covered; input problems come back as 422 naming the field. */
export async function priceOptions(db: Db | Tx, options: QuoteOptionInput[], ctx: CoverageContext): Promise<{ options: PricedOption[]; notes: string[] }> {
  const priced: PricedLine[][] = [];
  for (const [i, o] of options.entries()) priced.push(await priceLines(db, o.lines, ctx, `options.${i}`));
  const covered = coverageOf(() =>
    coverQuote({ agreement: ctx.agreement, warranty: ctx.warranty, visitDate: ctx.visitDate, options: priced.map((lines) => ({ lines })), taxRateBps: ctx.taxRateBps }),
  );
  return {
    options: options.map((o, i) => ({ title: o.title, description: o.description, lines: priced[i]!, coverage: covered.options[i]! })),
    notes: covered.notes,
  };
}
