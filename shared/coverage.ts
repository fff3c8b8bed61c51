// What a household's maintenance agreement covers for one visit. Pure: the server gathers the
// agreement, its plan version and the term's visits, and this decides from them.
import { AGREEMENT_STATUSES, AGREEMENT_STATUS_LABELS, type AgreementStatus } from './agreements';
import { coveredThroughLabel, formatTermDay, termLastDay, termRangeLabel } from './agreement-terms';
import { assertBps, assertCents, formatUsd } from './money';
import { SeasonInputError, seasonOf, type Season, type SeasonSettings } from './seasons';

export class CoverageInputError extends Error {
  constructor(
    readonly field: string,
    message: string,
  ) {
    super(`${field}: ${message}`);
    this.name = 'CoverageInputError';
  }
}

export type TuneUpSeason = Season;
export const TUNE_UP_SEASONS: readonly TuneUpSeason[] = ['cooling', 'heating'];

/** Statuses under which the plan's benefits apply (past due and later pause them until paid). */
export const COVERING_STATUSES: readonly AgreementStatus[] = ['active', 'renewal_due'];

export interface CoveragePlan {
  name: string;
  coolingVisits: number;
  heatingVisits: number;
  repairDiscountBps: number;
  diagnosticFeeWaived: boolean;
  priorityWindowHours: number;
}

export interface CoverageAgreement {
  status: AgreementStatus;
  /** First covered day, local ISO date. */
  startsOn: string;
  /** The day the term ends (not covered), local ISO date. */
  endsOn: string;
  /**
   * The exclusive end of the agreement's latest paid term (`lastPaidTerm`), which a renewal paid
   * early puts after this one; left out, this term's end.
   */
  paidUntil?: string;
  plan: CoveragePlan;
}

export interface CoverageVisit {
  id: string;
  kind: 'tune_up' | 'service_call';
  status: string;
  /** Local ISO date of the visit. */
  onDate: string;
}

export interface SeasonAllowance {
  season: TuneUpSeason;
  included: number;
  /** Completed tune-ups of this season in the term, not counting this visit. */
  used: number;
  /** Other tune-ups of this season booked in the term and not yet done. */
  booked: number;
  /** What remains after the used ones, before this visit. */
  left: number;
}

export interface Coverage {
  hasAgreement: boolean;
  /** Do the plan's benefits apply on this visit's date? */
  covered: boolean;
  status: AgreementStatus | null;
  statusLabel: string;
  planName: string | null;
  /** The term in force on the visit's date (end exclusive), with its last day and its range as screens show it. */
  term: { startsOn: string; endsOn: string; lastDay: string; label: string } | null;
  /** The agreement's last paid day ("Covered through …"): the latest paid term's, an early renewal's once it is paid. */
  coveredThrough: { lastDay: string; label: string } | null;
  allowances: SeasonAllowance[];
  /** The season this visit's tune-up belongs to; null for service calls. */
  tuneUpSeason: TuneUpSeason | null;
  /** A tune-up that the plan includes (one is left in its season). */
  tuneUpIncluded: boolean;
  repairDiscountBps: number;
  diagnosticFee: { applies: boolean; feeCents: number; waived: boolean; chargeCents: number };
  priorityWindowHours: number | null;
  /** One plain sentence per point, for the banner. */
  notes: string[];
}

const ISO_DATE = /^\d{4}-(0[1-9]|1[0-2])-(0[1-9]|[12]\d|3[01])$/;

function isoDate(value: unknown, field: string): string {
  if (typeof value !== 'string' || !ISO_DATE.test(value)) throw new CoverageInputError(field, `must be a date as YYYY-MM-DD, got ${String(value)}`);
  const d = new Date(`${value}T00:00:00Z`);
  if (Number.isNaN(d.getTime()) || d.toISOString().slice(0, 10) !== value) throw new CoverageInputError(field, `is not a real date: ${value}`);
  return value;
}

function count(value: unknown, field: string): number {
  if (typeof value !== 'number' || !Number.isInteger(value) || value < 0 || value > 52) {
    throw new CoverageInputError(field, `must be a whole number from 0 to 52, got ${String(value)}`);
  }
  return value;
}

/**
 * The tune-up season a date falls in, from the owner's season months (by default March through
 * August is the cooling tune-up and September through February the heating one).
 */
export function tuneUpSeasonOf(onDate: string, seasons?: Partial<SeasonSettings> | null): TuneUpSeason {
  const date = isoDate(onDate, 'onDate');
  try {
    return seasonOf(date, seasons);
  } catch (err) {
    if (err instanceof SeasonInputError) throw new CoverageInputError(`seasons.${err.field}`, err.message.replace(/^[^:]+: /, ''));
    throw err;
  }
}

const COUNTED_OUT = new Set(['canceled', 'no_show']);

function checkVisit(v: CoverageVisit, field: string): CoverageVisit {
  if (!v || typeof v !== 'object') throw new CoverageInputError(field, 'must be a visit');
  if (typeof v.id !== 'string' || v.id === '') throw new CoverageInputError(`${field}.id`, 'must be the visit id');
  if (v.kind !== 'tune_up' && v.kind !== 'service_call') throw new CoverageInputError(`${field}.kind`, `must be tune_up or service_call, got ${String(v.kind)}`);
  if (typeof v.status !== 'string') throw new CoverageInputError(`${field}.status`, 'must be the visit status');
  isoDate(v.onDate, `${field}.onDate`);
  return v;
}

const money = formatUsd;
const pct = (bps: number) => `${(bps / 100).toFixed(bps % 100 === 0 ? 0 : 2)} %`;

/**
 * What the agreement covers on this visit: tune-ups used and left this term by season, the repair
 * discount, and whether the diagnostic fee of a service call is waived.
 */
export function coverageFor(input: {
  agreement: CoverageAgreement | null;
  visit: CoverageVisit;
  /** Every visit at the property in the agreement's term; this visit may be among them. */
  termVisits: CoverageVisit[];
  diagnosticFeeCents: number;
  /** The owner's season months; the defaults apply when left out. */
  seasons?: Partial<SeasonSettings> | null;
}): Coverage {
  if (!input || typeof input !== 'object') throw new CoverageInputError('input', 'must be an object');
  const visit = checkVisit(input.visit, 'visit');
  assertCentsField(input.diagnosticFeeCents, 'diagnosticFeeCents');
  if (!Array.isArray(input.termVisits)) throw new CoverageInputError('termVisits', 'must be a list of visits');
  const others = input.termVisits.map((v, i) => checkVisit(v, `termVisits[${i}]`)).filter((v) => v.id !== visit.id);
  const tuneUpSeason = visit.kind === 'tune_up' ? tuneUpSeasonOf(visit.onDate, input.seasons) : null;
  const feeCents = input.diagnosticFeeCents;
  const isCall = visit.kind === 'service_call';

  const a = input.agreement;
  if (!a) {
    return {
      hasAgreement: false,
      covered: false,
      status: null,
      statusLabel: 'No plan',
      planName: null,
      term: null,
      coveredThrough: null,
      allowances: [],
      tuneUpSeason,
      tuneUpIncluded: false,
      repairDiscountBps: 0,
      diagnosticFee: { applies: isCall, feeCents: isCall ? feeCents : 0, waived: false, chargeCents: isCall ? feeCents : 0 },
      priorityWindowHours: null,
      notes: ['No maintenance agreement for this home: regular prices apply.', ...(isCall && feeCents > 0 ? [`Diagnostic fee ${money(feeCents)} applies.`] : [])],
    };
  }

  if (!AGREEMENT_STATUSES.includes(a.status)) throw new CoverageInputError('agreement.status', `must be one of ${AGREEMENT_STATUSES.join(', ')}, got ${String(a.status)}`);
  const startsOn = isoDate(a.startsOn, 'agreement.startsOn');
  const endsOn = isoDate(a.endsOn, 'agreement.endsOn');
  if (endsOn <= startsOn) throw new CoverageInputError('agreement.endsOn', 'must be after the start of the term');
  const paidUntil = a.paidUntil === undefined ? endsOn : isoDate(a.paidUntil, 'agreement.paidUntil');
  if (paidUntil < endsOn) throw new CoverageInputError('agreement.paidUntil', 'must not be before the end of the term');
  const p = a.plan;
  if (!p || typeof p !== 'object') throw new CoverageInputError('agreement.plan', 'must be the plan version');
  const included: Record<TuneUpSeason, number> = {
    cooling: count(p.coolingVisits, 'agreement.plan.coolingVisits'),
    heating: count(p.heatingVisits, 'agreement.plan.heatingVisits'),
  };
  try {
    assertBps(p.repairDiscountBps, 'agreement.plan.repairDiscountBps');
  } catch (err) {
    throw new CoverageInputError('agreement.plan.repairDiscountBps', (err as Error).message.replace(/^[^:]+: /, ''));
  }
  if (typeof p.diagnosticFeeWaived !== 'boolean') throw new CoverageInputError('agreement.plan.diagnosticFeeWaived', 'must be true or false');

  const inTerm = (d: string) => d >= startsOn && d < endsOn;
  const dated = inTerm(visit.onDate);
  const covered = dated && COVERING_STATUSES.includes(a.status);

  const allowances: SeasonAllowance[] = TUNE_UP_SEASONS.map((season) => {
    const same = others.filter((v) => v.kind === 'tune_up' && inTerm(v.onDate) && !COUNTED_OUT.has(v.status) && tuneUpSeasonOf(v.onDate, input.seasons) === season);
    const used = same.filter((v) => v.status === 'done').length;
    const booked = same.length - used;
    return { season, included: included[season], used, booked, left: Math.max(0, included[season] - used) };
  });
  const tuneUpIncluded = covered && tuneUpSeason !== null && allowances.find((x) => x.season === tuneUpSeason)!.left > 0;
  const waived = covered && isCall && p.diagnosticFeeWaived;
  const discount = covered ? p.repairDiscountBps : 0;

  const notes: string[] = [];
  if (!dated) {
    notes.push(
      visit.onDate < startsOn
        ? `The agreement starts on ${formatTermDay(startsOn)}, after this visit.`
        : `The agreement term ended on ${formatTermDay(termLastDay({ startsOn, endsOn }))}: regular prices apply until it is renewed.`,
    );
  } else if (!covered) {
    notes.push(`Agreement is ${AGREEMENT_STATUS_LABELS[a.status].toLowerCase()}: plan benefits are on hold.`);
  }
  if (tuneUpSeason) {
    const s = allowances.find((x) => x.season === tuneUpSeason)!;
    notes.push(
      tuneUpIncluded
        ? `This ${tuneUpSeason} tune-up is included (${s.used} of ${s.included} used before it).`
        : covered
          ? `The plan's ${tuneUpSeason} tune-up${s.included === 1 ? ' was' : 's were'} already used this term (${s.used} of ${s.included}): this one is charged.`
          : `This ${tuneUpSeason} tune-up is charged at the regular price.`,
    );
  }
  if (isCall && feeCents > 0) notes.push(waived ? `Diagnostic fee ${money(feeCents)} waived by the plan.` : `Diagnostic fee ${money(feeCents)} applies.`);
  if (discount > 0) notes.push(`Repairs ${pct(discount)} off.`);

  return {
    hasAgreement: true,
    covered,
    status: a.status,
    statusLabel: AGREEMENT_STATUS_LABELS[a.status],
    planName: typeof p.name === 'string' ? p.name : null,
    term: { startsOn, endsOn, lastDay: termLastDay({ startsOn, endsOn }), label: termRangeLabel({ startsOn, endsOn }) },
    coveredThrough: { lastDay: termLastDay({ startsOn, endsOn: paidUntil }), label: coveredThroughLabel({ startsOn, endsOn: paidUntil }) },
    allowances,
    tuneUpSeason,
    tuneUpIncluded,
    repairDiscountBps: discount,
    diagnosticFee: { applies: isCall, feeCents: isCall ? feeCents : 0, waived, chargeCents: isCall && !waived ? feeCents : 0 },
    priorityWindowHours: covered ? p.priorityWindowHours : null,
    notes,
  };
}

function assertCentsField(value: unknown, field: string): asserts value is number {
  try {
    assertCents(value, field);
  } catch (err) {
    throw new CoverageInputError(field, (err as Error).message.replace(/^[^:]+: /, ''));
  }
}
