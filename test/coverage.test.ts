import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { CoverageInputError, coverageFor, tuneUpSeasonOf, type CoverageAgreement, type CoverageVisit } from '../shared/coverage';

const plan = { name: 'Two-Season Care', coolingVisits: 1, heatingVisits: 1, repairDiscountBps: 1500, diagnosticFeeWaived: true, priorityWindowHours: 24 };
const agreement = (over: Partial<CoverageAgreement> = {}): CoverageAgreement => ({ status: 'active', startsOn: '2026-03-10', endsOn: '2027-03-10', plan, ...over });
const tuneUp = (id: string, onDate: string, status = 'done'): CoverageVisit => ({ id, kind: 'tune_up', status, onDate });
const call = (id: string, onDate: string, status = 'scheduled'): CoverageVisit => ({ id, kind: 'service_call', status, onDate });
const FEE = 8900;

function fieldOf(fn: () => unknown): string | undefined {
  try {
    fn();
  } catch (err) {
    if (err instanceof CoverageInputError) return err.field;
    throw err;
  }
  return undefined;
}

describe('tune-up season', () => {
  it('puts March–August in cooling and September–February in heating', () => {
    // Cooling tune-up in spring, heating tune-up in fall (common practice).
    expect(tuneUpSeasonOf('2026-03-01')).toBe('cooling');
    expect(tuneUpSeasonOf('2026-08-31')).toBe('cooling');
    expect(tuneUpSeasonOf('2026-09-01')).toBe('heating');
    expect(tuneUpSeasonOf('2026-02-28')).toBe('heating');
    expect(tuneUpSeasonOf('2026-12-01')).toBe('heating');
  });

  it('refuses a date that is not a real calendar day', () => {
    expect(fieldOf(() => tuneUpSeasonOf('2026-02-30'))).toBe('onDate');
    expect(fieldOf(() => tuneUpSeasonOf('12/01/2026'))).toBe('onDate');
  });
});

describe('coverage of a visit', () => {
  it('counts completed tune-ups of the same season in the term and leaves the other season open', () => {
    const c = coverageFor({
      agreement: agreement(),
      visit: tuneUp('today', '2026-10-20', 'scheduled'),
      termVisits: [tuneUp('spring', '2026-04-12'), tuneUp('today', '2026-10-20', 'scheduled'), call('june', '2026-06-02', 'done')],
      diagnosticFeeCents: FEE,
    });
    expect(c.covered).toBe(true);
    expect(c.tuneUpSeason).toBe('heating');
    expect(c.allowances).toEqual([
      { season: 'cooling', included: 1, used: 1, booked: 0, left: 0 },
      { season: 'heating', included: 1, used: 0, booked: 0, left: 1 },
    ]);
    expect(c.tuneUpIncluded).toBe(true);
    expect(c.diagnosticFee).toEqual({ applies: false, feeCents: 0, waived: false, chargeCents: 0 });
    expect(c.repairDiscountBps).toBe(1500);
  });

  it('charges a second tune-up in a season already used', () => {
    const c = coverageFor({ agreement: agreement(), visit: tuneUp('second', '2026-05-20', 'scheduled'), termVisits: [tuneUp('first', '2026-04-12')], diagnosticFeeCents: FEE });
    expect(c.tuneUpIncluded).toBe(false);
    expect(c.notes.join(' ')).toMatch(/already used/);
  });

  it('ignores canceled tune-ups and ones outside the term, and shows booked ones apart', () => {
    const c = coverageFor({
      agreement: agreement(),
      visit: call('call', '2026-07-01'),
      termVisits: [tuneUp('canceled', '2026-04-01', 'canceled'), tuneUp('before-term', '2026-03-01'), tuneUp('booked', '2026-08-01', 'scheduled')],
      diagnosticFeeCents: FEE,
    });
    expect(c.allowances[0]).toEqual({ season: 'cooling', included: 1, used: 0, booked: 1, left: 1 });
  });

  it('waives the diagnostic fee on a service call when the plan says so', () => {
    const c = coverageFor({ agreement: agreement(), visit: call('c', '2026-07-01'), termVisits: [], diagnosticFeeCents: FEE });
    expect(c.diagnosticFee).toEqual({ applies: true, feeCents: FEE, waived: true, chargeCents: 0 });
    expect(c.notes).toContain('Diagnostic fee $89.00 waived by the plan.');
    expect(c.notes).toContain('Repairs 15 % off.');

    const noWaiver = coverageFor({
      agreement: agreement({ plan: { ...plan, diagnosticFeeWaived: false } }),
      visit: call('c', '2026-07-01'),
      termVisits: [],
      diagnosticFeeCents: FEE,
    });
    expect(noWaiver.diagnosticFee).toEqual({ applies: true, feeCents: FEE, waived: false, chargeCents: FEE });
  });

  it('gives nothing on the day the term ends or before it starts, and regular prices without a plan', () => {
    // The end date is the first day not covered.
    const ended = coverageFor({ agreement: agreement(), visit: call('c', '2027-03-10'), termVisits: [], diagnosticFeeCents: FEE });
    expect(ended).toMatchObject({ covered: false, repairDiscountBps: 0, diagnosticFee: { waived: false, chargeCents: FEE }, priorityWindowHours: null });
    const lastDay = coverageFor({ agreement: agreement(), visit: call('c', '2027-03-09'), termVisits: [], diagnosticFeeCents: FEE });
    expect(lastDay.covered).toBe(true);
    const early = coverageFor({ agreement: agreement(), visit: call('c', '2026-03-09'), termVisits: [], diagnosticFeeCents: FEE });
    expect(early.covered).toBe(false);
    const none = coverageFor({ agreement: null, visit: call('c', '2026-07-01'), termVisits: [], diagnosticFeeCents: FEE });
    expect(none).toMatchObject({ hasAgreement: false, covered: false, statusLabel: 'No plan', diagnosticFee: { chargeCents: FEE } });
  });

  it("names the agreement's last paid day: a renewal paid early moves it, the term in force stays", () => {
    const before = coverageFor({ agreement: agreement(), visit: call('c', '2027-03-01'), termVisits: [], diagnosticFeeCents: FEE });
    expect(before.coveredThrough).toEqual({ lastDay: '2027-03-09', label: 'Covered through March 9, 2027' });
    const renewed = coverageFor({ agreement: agreement({ paidUntil: '2028-03-10' }), visit: call('c', '2027-03-01'), termVisits: [], diagnosticFeeCents: FEE });
    expect(renewed).toMatchObject({
      covered: true,
      term: { endsOn: '2027-03-10', lastDay: '2027-03-09' },
      coveredThrough: { lastDay: '2028-03-09', label: 'Covered through March 9, 2028' },
    });
    expect(fieldOf(() => coverageFor({ agreement: agreement({ paidUntil: '2026-12-01' }), visit: call('c', '2027-03-01'), termVisits: [], diagnosticFeeCents: FEE }))).toBe(
      'agreement.paidUntil',
    );
  });

  it('puts benefits on hold while the agreement is not in good standing', () => {
    for (const status of ['pending', 'past_due', 'lapsed', 'canceled'] as const) {
      const c = coverageFor({ agreement: agreement({ status }), visit: call('c', '2026-07-01'), termVisits: [], diagnosticFeeCents: FEE });
      expect(c.covered, status).toBe(false);
      expect(c.diagnosticFee.chargeCents, status).toBe(FEE);
    }
    const renewing = coverageFor({ agreement: agreement({ status: 'renewal_due' }), visit: call('c', '2026-07-01'), termVisits: [], diagnosticFeeCents: FEE });
    expect(renewing.covered).toBe(true);
  });

  it('names the field for bad input', () => {
    const visit = call('c', '2026-07-01');
    expect(fieldOf(() => coverageFor({ agreement: agreement(), visit, termVisits: [], diagnosticFeeCents: 12.5 }))).toBe('diagnosticFeeCents');
    expect(fieldOf(() => coverageFor({ agreement: agreement({ endsOn: '2026-01-01' }), visit, termVisits: [], diagnosticFeeCents: FEE }))).toBe('agreement.endsOn');
    expect(fieldOf(() => coverageFor({ agreement: agreement({ plan: { ...plan, coolingVisits: -1 } }), visit, termVisits: [], diagnosticFeeCents: FEE }))).toBe(
      'agreement.plan.coolingVisits',
    );
    expect(fieldOf(() => coverageFor({ agreement: agreement({ plan: { ...plan, repairDiscountBps: 12000 } }), visit, termVisits: [], diagnosticFeeCents: FEE }))).toBe(
      'agreement.plan.repairDiscountBps',
    );
    expect(fieldOf(() => coverageFor({ agreement: agreement(), visit: { ...visit, onDate: 'soon' }, termVisits: [], diagnosticFeeCents: FEE }))).toBe('visit.onDate');
    expect(fieldOf(() => coverageFor({ agreement: agreement(), visit, termVisits: [{ ...visit, id: 'x', kind: 'repair' as never }], diagnosticFeeCents: FEE }))).toBe(
      'termVisits[0].kind',
    );
  });

  it('never reports more used than done or more left than included (property)', () => {
    const day = fc.integer({ min: 0, max: 364 }).map((d) => new Date(Date.UTC(2026, 2, 10 + d)).toISOString().slice(0, 10));
    const v = fc.record({
      id: fc.uuid(),
      kind: fc.constantFrom('tune_up' as const, 'service_call' as const),
      status: fc.constantFrom('done', 'scheduled', 'canceled', 'no_show'),
      onDate: day,
    });
    fc.assert(
      fc.property(fc.array(v, { maxLength: 12 }), fc.integer({ min: 0, max: 4 }), fc.integer({ min: 0, max: 4 }), v, (visits, cool, heat, visit) => {
        const c = coverageFor({ agreement: agreement({ plan: { ...plan, coolingVisits: cool, heatingVisits: heat } }), visit, termVisits: visits, diagnosticFeeCents: FEE });
        for (const a of c.allowances) {
          const done = visits.filter((x) => x.id !== visit.id && x.kind === 'tune_up' && x.status === 'done' && tuneUpSeasonOf(x.onDate) === a.season).length;
          expect(a.used).toBe(done);
          expect(a.left).toBe(Math.max(0, a.included - done));
        }
        if (c.tuneUpIncluded) expect(c.allowances.find((a) => a.season === c.tuneUpSeason)!.left).toBeGreaterThan(0);
      }),
    );
  });
});
