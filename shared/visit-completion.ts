// What closing a visit asks for: a reason for any tune-up checklist item left open, and the
// homeowner's signature when a repair was done. The server applies it; the visit screen's
// confirmation asks for the same things before sending.

export interface ChecklistState {
  equipmentLabel: string;
  items: { text: string; result: string | null }[];
}

/** Checklist items with no result yet, as "Outdoor unit: Clean the condenser coil". */
export function unfinishedItems(sections: readonly ChecklistState[]): string[] {
  return sections.flatMap((s) => s.items.filter((i) => !i.result).map((i) => `${s.equipmentLabel}: ${i.text}`));
}

export interface CompletionAnswers {
  skippedReason: string;
  repairDone: boolean;
  signature?: { image: string; signedBy: string } | undefined;
}

/** Field → message for what is still missing; empty when the visit can be closed. */
export function completionProblems(unfinished: readonly string[], answers: CompletionAnswers): Record<string, string> {
  const out: Record<string, string> = {};
  if (unfinished.length && !answers.skippedReason.trim()) {
    out['skippedReason'] = `Say why ${unfinished.length === 1 ? 'this checklist item was' : `these ${unfinished.length} checklist items were`} skipped: ${unfinished.join('; ')}`;
  }
  if (answers.repairDone && !answers.signature) out['signature'] = 'A repair was done: the homeowner signs for it before the visit is closed';
  return out;
}
