import type { QuoteLineInput, QuoteOptionInput, QuoteView } from '../../../../shared/schemas/pricebook';

/**
 * A quote as it is being built on the phone: what was picked and how many. The prices, the
 * coverage of each line and the totals are the server's, worked out by the same rules as invoices.
 */
export interface DraftLine {
  key: string;
  source: 'item' | 'task';
  refId: string;
  sku: string | null;
  description: string;
  quantity: number;
  stockLocationId: string | null;
  /** Where the part comes from, for the technician: "On your truck (3 left)". */
  from: string | null;
}

export interface DraftOption {
  key: string;
  title: string;
  description: string;
  lines: DraftLine[];
}

/** A line picked in the search or the replacement panel, before it joins an option. */
export type PickedLine = Omit<DraftLine, 'key'>;

let seq = 0;
export const newKey = (prefix: string) => `${prefix}${++seq}`;

export const emptyOption = (title: string): DraftOption => ({ key: newKey('o'), title, description: '', lines: [] });

/** Adds a line, or raises the quantity of the same part from the same place. */
export function addLine(option: DraftOption, picked: PickedLine): DraftOption {
  const same = option.lines.find((l) => l.source === picked.source && l.refId === picked.refId && l.stockLocationId === picked.stockLocationId);
  if (same) return { ...option, lines: option.lines.map((l) => (l === same ? { ...l, quantity: l.quantity + picked.quantity } : l)) };
  return { ...option, lines: [...option.lines, { ...picked, key: newKey('l') }] };
}

/** The request body's options; an untitled option gets a plain name rather than an error. */
export function optionInputs(options: DraftOption[], equipmentId: string | null): QuoteOptionInput[] {
  return options.map((o, i) => ({
    title: o.title.trim() || `Option ${i + 1}`,
    description: o.description.trim(),
    lines: o.lines.map((l): QuoteLineInput =>
      l.source === 'item'
        ? { source: 'item', itemId: l.refId, quantity: l.quantity, stockLocationId: l.stockLocationId, equipmentId }
        : { source: 'task', taskId: l.refId, quantity: l.quantity, stockLocationId: l.stockLocationId, equipmentId },
    ),
  }));
}

/** A saved quote back into the editor: the lines of one flat-rate task come back as the task, done once. */
export function draftFrom(view: QuoteView): DraftOption[] {
  return view.options.map((o) => {
    const lines: DraftLine[] = [];
    const groups = new Set<string>();
    for (const l of o.lines) {
      if (l.taskId) {
        const g = l.group ?? l.taskId;
        if (groups.has(g)) continue;
        groups.add(g);
        lines.push({ key: newKey('l'), source: 'task', refId: l.taskId, sku: null, description: l.description, quantity: 1, stockLocationId: l.stockLocationId, from: null });
      } else if (l.itemId) {
        lines.push({
          key: newKey('l'),
          source: 'item',
          refId: l.itemId,
          sku: l.sku,
          description: l.description,
          quantity: l.quantity,
          stockLocationId: l.stockLocationId,
          from: null,
        });
      }
    }
    return { key: newKey('o'), title: o.title, description: o.description, lines };
  });
}
