import { DateTime } from 'luxon';
import { divRoundHalfUp, assertCents } from './money';

// Dates are calendar dates as ISO `YYYY-MM-DD` strings, computed in UTC so a
// server's local zone or a daylight-saving change never shifts a day.

export class RenewalError extends Error {
  constructor(
    readonly field: string,
    message: string,
  ) {
    super(`${field}: ${message}`);
    this.name = 'RenewalError';
  }
}

function parseDate(value: unknown, field: string): DateTime {
  if (typeof value !== 'string' || !/^\d{4}-\d{2}-\d{2}$/.test(value)) {
    throw new RenewalError(field, `must be a date as YYYY-MM-DD, got ${String(value)}`);
  }
  const d = DateTime.fromISO(value, { zone: 'utc' });
  if (!d.isValid) throw new RenewalError(field, `is not a real calendar date: ${value}`);
  return d;
}

const iso = (d: DateTime): string => d.toISODate() as string;

/** `date` plus `days` calendar days. */
export function addDays(date: string, days: number, field = 'date'): string {
  if (!Number.isInteger(days)) throw new RenewalError('days', `must be a whole number, got ${String(days)}`);
  return iso(parseDate(date, field).plus({ days }));
}

/** Whole days from `from` to `to` (negative when `to` is earlier). */
export function daysBetween(from: string, to: string): number {
  return Math.round(parseDate(to, 'to').diff(parseDate(from, 'from'), 'days').days);
}

export const TERM_MONTHS = 12;

/**
 * End of a 12-month agreement term, EXCLUSIVE: the term starting 2026-03-15
 * covers 2026-03-15 through 2027-03-14 and "ends at" 2027-03-15, which is also
 * the first day of the renewed term. A term starting on 29 February ends at
 * 1 March, so the homeowner still gets every day up to 28 February.
 */
export function termEnd(start: string): string {
  const s = parseDate(start, 'termStart');
  if (s.month === 2 && s.day === 29) return iso(DateTime.utc(s.year + 1, 3, 1));
  return iso(s.plus({ months: TERM_MONTHS }));
}

/** Last day the agreement covers (the day before the exclusive end). */
export function lastCoveredDay(start: string): string {
  return addDays(termEnd(start), -1);
}

// ---------- Agreement status ----------

export const AGREEMENT_STATUSES = ['pending', 'active', 'renewal_due', 'past_due', 'lapsed', 'canceled'] as const;
export type AgreementStatus = (typeof AGREEMENT_STATUSES)[number];

export const AGREEMENT_EVENTS = ['paid', 'renewal_window_opened', 'term_ended_unpaid', 'charge_failed', 'charge_succeeded', 'grace_expired', 'canceled', 'manual_renewal'] as const;
export type AgreementEvent = (typeof AGREEMENT_EVENTS)[number];

/**
 * The allowed transitions; anything else is refused.
 * - pending: waiting for the first payment.
 * - renewal_due: the 60-day renewal window is open; the renewal charge runs at term end.
 * - past_due: term ended without payment; dunning retries run during the grace period.
 * - lapsed: grace expired; paying (or the office renewing by hand) reinstates it.
 * - canceled: final.
 */
const TRANSITIONS: Record<AgreementStatus, Partial<Record<AgreementEvent, AgreementStatus>>> = {
  pending: { paid: 'active', charge_succeeded: 'active', canceled: 'canceled' },
  active: {
    renewal_window_opened: 'renewal_due',
    term_ended_unpaid: 'past_due',
    manual_renewal: 'active',
    canceled: 'canceled',
  },
  renewal_due: {
    paid: 'active',
    charge_succeeded: 'active',
    manual_renewal: 'active',
    charge_failed: 'past_due',
    term_ended_unpaid: 'past_due',
    canceled: 'canceled',
  },
  past_due: {
    paid: 'active',
    charge_succeeded: 'active',
    manual_renewal: 'active',
    charge_failed: 'past_due',
    grace_expired: 'lapsed',
    canceled: 'canceled',
  },
  lapsed: { paid: 'active', manual_renewal: 'active', canceled: 'canceled' },
  canceled: {},
};

export function canTransition(current: AgreementStatus, event: AgreementEvent): boolean {
  return TRANSITIONS[current]?.[event] !== undefined;
}

/** Next status after `event`; throws for an unknown status or event, or a transition not allowed. */
export function nextAgreementStatus(current: AgreementStatus, event: AgreementEvent): AgreementStatus {
  if (!AGREEMENT_STATUSES.includes(current)) {
    throw new RenewalError('status', `must be one of ${AGREEMENT_STATUSES.join(', ')}, got ${String(current)}`);
  }
  if (!AGREEMENT_EVENTS.includes(event)) {
    throw new RenewalError('event', `must be one of ${AGREEMENT_EVENTS.join(', ')}, got ${String(event)}`);
  }
  const next = TRANSITIONS[current][event];
  if (next === undefined) {
    throw new RenewalError('event', `an agreement that is ${current} cannot take "${event}"`);
  }
  return next;
}

// ---------- Renewal notices ----------

export const RENEWAL_WINDOW_DAYS = 60;
/** Days before the term end on which a renewal notice goes out. */
export const RENEWAL_NOTICE_DAYS = [60, 30, 7] as const;
export type RenewalNotice = (typeof RENEWAL_NOTICE_DAYS)[number];

/** The day the renewal window opens: 60 days before the (exclusive) term end. */
export function renewalWindowOpens(termEndDate: string): string {
  return addDays(termEndDate, -RENEWAL_WINDOW_DAYS, 'termEnd');
}

export interface NoticeAgreement {
  status: AgreementStatus;
  termEnd: string;
  noticesSent: readonly RenewalNotice[];
}

/**
 * Notices to send today. A notice is due from (term end − N days) until the
 * term ends, if not yet sent. When a run was missed and several are due at
 * once, only the latest (closest to the end) is returned, so a homeowner
 * never gets two notices on one day; the earlier one is simply skipped.
 * Only active and renewal_due agreements get notices.
 */
export function renewalNoticesDue(agreement: NoticeAgreement, today: string): RenewalNotice[] {
  const end = parseDate(agreement.termEnd, 'termEnd');
  const now = parseDate(today, 'today');
  if (!Array.isArray(agreement.noticesSent)) throw new RenewalError('noticesSent', 'must be a list');
  if (agreement.status !== 'active' && agreement.status !== 'renewal_due') return [];
  if (now >= end) return [];
  const due = RENEWAL_NOTICE_DAYS.filter((n) => now >= end.minus({ days: n }));
  const latest = due[due.length - 1];
  if (latest === undefined || agreement.noticesSent.includes(latest)) return [];
  // A later notice already sent means earlier ones are no longer wanted.
  if (agreement.noticesSent.some((s) => s < latest)) return [];
  return [latest];
}

// ---------- Dunning and lapse ----------

/** Retries of a failed renewal charge, in days after the failure. */
export const DUNNING_RETRY_DAYS = [3, 7, 14] as const;
export const DEFAULT_GRACE_DAYS = 30;

/** Dates of the dunning retries after a charge failed on `failedOn`. */
export function dunningRetryDates(failedOn: string): string[] {
  parseDate(failedOn, 'failedOn');
  return DUNNING_RETRY_DAYS.map((d) => addDays(failedOn, d, 'failedOn'));
}

/** Date of the next retry not yet made, or null when all retries are used up. */
export function nextDunningRetry(failedOn: string, retriesMade: number): string | null {
  if (!Number.isInteger(retriesMade) || retriesMade < 0) {
    throw new RenewalError('retriesMade', `must be a whole number 0 or more, got ${String(retriesMade)}`);
  }
  const dates = dunningRetryDates(failedOn).slice(retriesMade);
  return dates[0] ?? null;
}

/** Whether a retry is due today (its date has come and it has not been made). */
export function dunningRetryDue(failedOn: string, retriesMade: number, today: string): boolean {
  parseDate(today, 'today');
  const next = nextDunningRetry(failedOn, retriesMade);
  return next !== null && next <= today;
}

/** The day an unpaid agreement lapses: term end + grace days. */
export function lapseDate(termEndDate: string, graceDays = DEFAULT_GRACE_DAYS): string {
  if (!Number.isInteger(graceDays) || graceDays < 0) {
    throw new RenewalError('graceDays', `must be a whole number 0 or more, got ${String(graceDays)}`);
  }
  return addDays(termEndDate, graceDays, 'termEnd');
}

export function isGraceExpired(termEndDate: string, today: string, graceDays = DEFAULT_GRACE_DAYS): boolean {
  parseDate(today, 'today');
  return today >= lapseDate(termEndDate, graceDays);
}

// ---------- Keys and proration ----------

/**
 * Idempotency key for the renewal charge of one term: the same agreement and
 * term always give the same key, so a retried job can never charge twice.
 */
export function idempotencyKeyForRenewal(agreementId: string | number, termStart: string): string {
  const id = String(agreementId ?? '').trim();
  if (id === '' || !/^[A-Za-z0-9_-]{1,100}$/.test(id)) {
    throw new RenewalError('agreementId', `must be letters, digits, "-" or "_", got ${String(agreementId)}`);
  }
  parseDate(termStart, 'termStart');
  return `seasonwell-renewal-${id}-${termStart}`;
}

export interface TierChange {
  termStart: string;
  termEnd: string;
  changeDate: string;
  oldPriceCents: number;
  newPriceCents: number;
}

/**
 * Charge (positive) or credit (negative) for moving to another plan tier
 * part-way through a term: (new − old) × remaining days / term days, with the
 * change day itself counted as remaining. The magnitude is rounded half up to
 * the cent, so a credit and a charge of the same size round alike.
 */
export function prorateTierChange(change: TierChange): number {
  const start = parseDate(change.termStart, 'termStart');
  const end = parseDate(change.termEnd, 'termEnd');
  const at = parseDate(change.changeDate, 'changeDate');
  assertCents(change.oldPriceCents, 'oldPriceCents');
  assertCents(change.newPriceCents, 'newPriceCents');
  if (end <= start) throw new RenewalError('termEnd', 'must be after termStart');
  if (at < start || at >= end) {
    throw new RenewalError('changeDate', `must fall within the term ${change.termStart} to ${change.termEnd} (exclusive)`);
  }
  const termDays = Math.round(end.diff(start, 'days').days);
  const remainingDays = Math.round(end.diff(at, 'days').days);
  return divRoundHalfUp(BigInt(change.newPriceCents - change.oldPriceCents) * BigInt(remainingDays), termDays);
}
