import { dateTimeFormat } from './date-formats';

// No date library here: the client's pages import these too.

/**
 * One term of an agreement. `endsOn` is EXCLUSIVE, as `termEnd` in shared/renewals.ts makes it:
 * the term covers `startsOn` through the day before `endsOn`.
 */
export interface TermRange {
  startsOn: string;
  endsOn: string;
}

/**
 * The term in force on `date`: the one whose range holds it. A renewal paid early adds the next
 * term after the current one, so on any day at most one term holds the date; if data ever holds
 * two, the one that started later wins.
 */
export function termOn<T extends TermRange>(terms: readonly T[], date: string): T | null {
  let found: T | null = null;
  for (const t of terms) {
    if (date >= t.startsOn && date < t.endsOn && (!found || t.startsOn > found.startsOn)) found = t;
  }
  return found;
}

/**
 * The agreement's latest paid term: the one that ends last (the range the agreement row holds).
 * A renewal paid early adds the next term after the current one, so from the moment it is paid
 * this is the new term while `termOn` still gives the current one. "Covered through" on every
 * screen, e-mail and PDF names this term's last day: `coveredThroughLabel(lastPaidTerm(terms))`.
 */
export function lastPaidTerm<T extends TermRange>(terms: readonly T[]): T | null {
  let found: T | null = null;
  for (const t of terms) if (!found || t.endsOn > found.endsOn) found = t;
  return found;
}

/** The last day a term covers: the day before its exclusive end. The only definition of it. */
export function termLastDay(term: TermRange): string {
  const d = new Date(`${term.endsOn}T00:00:00Z`);
  if (!/^\d{4}-\d{2}-\d{2}$/.test(term.endsOn) || Number.isNaN(d.getTime())) throw new RangeError(`endsOn: must be a date as YYYY-MM-DD, got ${term.endsOn}`);
  d.setUTCDate(d.getUTCDate() - 1);
  return d.toISOString().slice(0, 10);
}

/**
 * A calendar date as every screen, e-mail and PDF shows it ("March 14, 2027"). Term dates are
 * already days in the company's time zone, so they are formatted as UTC midnights, which no
 * zone shifts.
 */
export function formatTermDay(date: string): string {
  return dateTimeFormat('en-US', { dateStyle: 'long', timeZone: 'UTC' }).format(new Date(`${date}T00:00:00Z`));
}

/** "March 15, 2026 to March 14, 2027": a term's first and last covered day. */
export function termRangeLabel(term: TermRange): string {
  return `${formatTermDay(term.startsOn)} to ${formatTermDay(termLastDay(term))}`;
}

/** "Covered through March 14, 2027": the sentence every screen uses for a term's last day. */
export function coveredThroughLabel(term: TermRange): string {
  return `Covered through ${formatTermDay(termLastDay(term))}`;
}
