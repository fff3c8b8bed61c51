import { describe, expect, it } from 'vitest';
import { DateTime } from 'luxon';
import {
  AGREEMENT_EVENTS,
  AGREEMENT_STATUSES,
  type AgreementEvent,
  type AgreementStatus,
  canTransition,
  dunningRetryDates,
  dunningRetryDue,
  idempotencyKeyForRenewal,
  isGraceExpired,
  lapseDate,
  lastCoveredDay,
  nextAgreementStatus,
  nextDunningRetry,
  prorateTierChange,
  renewalNoticesDue,
  renewalWindowOpens,
  termEnd,
} from '../shared/renewals';

describe('termEnd', () => {
  it('ends (exclusive) on the same calendar day a year later', () => {
    expect(termEnd('2026-03-15')).toBe('2027-03-15');
    expect(lastCoveredDay('2026-03-15')).toBe('2027-03-14');
    expect(termEnd('2026-12-31')).toBe('2027-12-31');
  });

  it('a 29 February start ends at 1 March, covering through 28 February', () => {
    expect(termEnd('2028-02-29')).toBe('2029-03-01');
    expect(lastCoveredDay('2028-02-29')).toBe('2029-02-28');
  });

  it('is unaffected by the process time zone (computed in UTC)', () => {
    // 2026-03-08 is the US spring-forward date (from memory); a local-time computation could slip a day
    expect(termEnd('2026-03-08')).toBe('2027-03-08');
    expect(termEnd('2026-11-01')).toBe('2027-11-01');
  });

  it('refuses bad dates, naming the field', () => {
    expect(() => termEnd('2026-02-30')).toThrow(/termStart.*calendar/);
    expect(() => termEnd('03/15/2026')).toThrow(/termStart.*YYYY-MM-DD/);
  });
});

describe('nextAgreementStatus', () => {
  const allowed: [AgreementStatus, AgreementEvent, AgreementStatus][] = [
    ['pending', 'paid', 'active'],
    ['pending', 'charge_succeeded', 'active'],
    ['pending', 'canceled', 'canceled'],
    ['active', 'renewal_window_opened', 'renewal_due'],
    ['active', 'term_ended_unpaid', 'past_due'],
    ['active', 'manual_renewal', 'active'],
    ['active', 'canceled', 'canceled'],
    ['renewal_due', 'paid', 'active'],
    ['renewal_due', 'charge_succeeded', 'active'],
    ['renewal_due', 'manual_renewal', 'active'],
    ['renewal_due', 'charge_failed', 'past_due'],
    ['renewal_due', 'term_ended_unpaid', 'past_due'],
    ['renewal_due', 'canceled', 'canceled'],
    ['past_due', 'paid', 'active'],
    ['past_due', 'charge_succeeded', 'active'],
    ['past_due', 'manual_renewal', 'active'],
    ['past_due', 'charge_failed', 'past_due'],
    ['past_due', 'grace_expired', 'lapsed'],
    ['past_due', 'canceled', 'canceled'],
    ['lapsed', 'paid', 'active'],
    ['lapsed', 'manual_renewal', 'active'],
    ['lapsed', 'canceled', 'canceled'],
  ];

  it.each(allowed)('%s + %s → %s', (from, event, to) => {
    expect(nextAgreementStatus(from, event)).toBe(to);
  });

  it('refuses every other pair', () => {
    let refused = 0;
    for (const s of AGREEMENT_STATUSES) {
      for (const e of AGREEMENT_EVENTS) {
        if (allowed.some(([a, b]) => a === s && b === e)) continue;
        expect(canTransition(s, e)).toBe(false);
        expect(() => nextAgreementStatus(s, e)).toThrow(/event/);
        refused++;
      }
    }
    // 6 statuses × 8 events = 48 pairs, 22 allowed
    expect(refused).toBe(48 - 22);
  });

  it('a canceled agreement takes no event', () => {
    expect(() => nextAgreementStatus('canceled', 'paid')).toThrow(/canceled cannot take "paid"/);
  });

  it('names the field for unknown values', () => {
    expect(() => nextAgreementStatus('frozen' as never, 'paid')).toThrow(/^status/);
    expect(() => nextAgreementStatus('active', 'refunded' as never)).toThrow(/^event/);
  });
});

describe('renewal notices', () => {
  // Term 2026-03-15 → 2027-03-15 (exclusive): notices at 60, 30 and 7 days before the end
  const end = termEnd('2026-03-15');
  const base = { status: 'active' as AgreementStatus, termEnd: end, noticesSent: [] as (60 | 30 | 7)[] };

  it('the renewal window opens 60 days before the end', () => {
    // 2027-03-15 − 60 days: 15 days back to 28 Feb, 28 more to 31 Jan, 17 more = 14 Jan
    expect(renewalWindowOpens(end)).toBe('2027-01-14');
  });

  it('sends each notice on its day', () => {
    expect(renewalNoticesDue(base, '2027-01-13')).toEqual([]);
    expect(renewalNoticesDue(base, '2027-01-14')).toEqual([60]);
    expect(renewalNoticesDue({ ...base, noticesSent: [60] }, '2027-01-20')).toEqual([]);
    // 2027-03-15 − 30 days = 2027-02-13
    expect(renewalNoticesDue({ ...base, noticesSent: [60] }, '2027-02-12')).toEqual([]);
    expect(renewalNoticesDue({ ...base, noticesSent: [60] }, '2027-02-13')).toEqual([30]);
    // 2027-03-15 − 7 days = 2027-03-08
    expect(renewalNoticesDue({ ...base, status: 'renewal_due', noticesSent: [60, 30] }, '2027-03-08')).toEqual([7]);
    expect(renewalNoticesDue({ ...base, noticesSent: [60, 30, 7] }, '2027-03-10')).toEqual([]);
  });

  it('after a missed run sends only the latest notice, and none after the end', () => {
    expect(renewalNoticesDue(base, '2027-03-09')).toEqual([7]);
    expect(renewalNoticesDue({ ...base, noticesSent: [7] }, '2027-03-10')).toEqual([]);
    expect(renewalNoticesDue(base, '2027-03-15')).toEqual([]);
  });

  it('sends nothing to agreements that are not live', () => {
    for (const status of ['pending', 'past_due', 'lapsed', 'canceled'] as AgreementStatus[]) {
      expect(renewalNoticesDue({ ...base, status }, '2027-01-14')).toEqual([]);
    }
  });

  it('refuses a bad date', () => {
    expect(() => renewalNoticesDue(base, '2027-1-14')).toThrow(/today/);
  });
});

describe('dunning and lapse', () => {
  it('retries on days 3, 7 and 14 after a failed charge', () => {
    // failure on 2027-03-15: +3 = 18 Mar, +7 = 22 Mar, +14 = 29 Mar
    expect(dunningRetryDates('2027-03-15')).toEqual(['2027-03-18', '2027-03-22', '2027-03-29']);
    // across a month end: 2027-01-28 + 3 = 31 Jan, + 7 = 4 Feb, + 14 = 11 Feb
    expect(dunningRetryDates('2027-01-28')).toEqual(['2027-01-31', '2027-02-04', '2027-02-11']);
  });

  it('tells the next retry and whether it is due', () => {
    expect(nextDunningRetry('2027-03-15', 0)).toBe('2027-03-18');
    expect(nextDunningRetry('2027-03-15', 2)).toBe('2027-03-29');
    expect(nextDunningRetry('2027-03-15', 3)).toBeNull();
    expect(dunningRetryDue('2027-03-15', 0, '2027-03-17')).toBe(false);
    expect(dunningRetryDue('2027-03-15', 0, '2027-03-18')).toBe(true);
    expect(dunningRetryDue('2027-03-15', 1, '2027-03-20')).toBe(false);
    expect(dunningRetryDue('2027-03-15', 3, '2027-04-30')).toBe(false);
    expect(() => nextDunningRetry('2027-03-15', -1)).toThrow(/retriesMade/);
  });

  it('lapses 30 days after the term end by default', () => {
    // 2027-03-15 + 30 days = 2027-04-14
    expect(lapseDate('2027-03-15')).toBe('2027-04-14');
    expect(isGraceExpired('2027-03-15', '2027-04-13')).toBe(false);
    expect(isGraceExpired('2027-03-15', '2027-04-14')).toBe(true);
    expect(lapseDate('2027-03-15', 45)).toBe('2027-04-29');
    expect(() => lapseDate('2027-03-15', -5)).toThrow(/graceDays/);
  });
});

describe('idempotencyKeyForRenewal', () => {
  it('is stable per agreement and term, and differs between terms', () => {
    const a = idempotencyKeyForRenewal('agr_42', '2026-03-15');
    expect(idempotencyKeyForRenewal('agr_42', '2026-03-15')).toBe(a);
    expect(idempotencyKeyForRenewal('agr_42', '2027-03-15')).not.toBe(a);
    expect(idempotencyKeyForRenewal('agr_43', '2026-03-15')).not.toBe(a);
    expect(idempotencyKeyForRenewal(42, '2026-03-15')).toBe('seasonwell-renewal-42-2026-03-15');
    // Stripe caps idempotency keys at 255 characters (Stripe API reference, idempotent requests)
    expect(a.length).toBeLessThanOrEqual(255);
  });

  it('refuses empty ids and bad dates', () => {
    expect(() => idempotencyKeyForRenewal('', '2026-03-15')).toThrow(/agreementId/);
    expect(() => idempotencyKeyForRenewal('a b', '2026-03-15')).toThrow(/agreementId/);
    expect(() => idempotencyKeyForRenewal('agr_1', 'March')).toThrow(/termStart/);
  });
});

describe('prorateTierChange', () => {
  it('$199 → $299 on day 100 of a 365-day term charges $72.60', () => {
    // 2026-01-01 + 100 days = 2026-04-11 (Jan 31 + Feb 28 + Mar 31 = 90, +10); 265 of 365 days remain.
    // (29900 − 19900) × 265 / 365 = 2 650 000 / 365 = 7260.27 ¢ → 7260 ¢ = $72.60
    expect(prorateTierChange({ termStart: '2026-01-01', termEnd: '2027-01-01', changeDate: '2026-04-11', oldPriceCents: 19_900, newPriceCents: 29_900 })).toBe(7_260);
  });

  it('a downgrade on the same day credits the same amount', () => {
    // (19900 − 29900) × 265 / 365 = −7260.27 ¢ → −7260 ¢
    expect(prorateTierChange({ termStart: '2026-01-01', termEnd: '2027-01-01', changeDate: '2026-04-11', oldPriceCents: 29_900, newPriceCents: 19_900 })).toBe(-7_260);
  });

  it('counts 366 days in a leap-year term', () => {
    // 2028 is a leap year: 2028-01-01 → 2029-01-01 is 366 days. 2028-07-01 is day 182 (31+29+31+30+31+30),
    // so 184 days remain: 10000 × 184 / 366 = 5027.32 ¢ → 5027 ¢
    expect(prorateTierChange({ termStart: '2028-01-01', termEnd: '2029-01-01', changeDate: '2028-07-01', oldPriceCents: 19_900, newPriceCents: 29_900 })).toBe(5_027);
  });

  it('an exact half cent rounds up (and a half-cent credit rounds to the larger credit)', () => {
    // Half-way through a 366-day term (183 days remain) a $100.01 difference is 10001 × 183 / 366 = 5000.5 ¢ → 5001 ¢
    const halfWay = { termStart: '2028-01-01', termEnd: '2029-01-01', changeDate: '2028-07-02' };
    expect(prorateTierChange({ ...halfWay, oldPriceCents: 19_900, newPriceCents: 29_901 })).toBe(5_001);
    expect(prorateTierChange({ ...halfWay, oldPriceCents: 29_901, newPriceCents: 19_900 })).toBe(-5_001);
  });

  it('on the first day charges the whole difference, on the last day 1/365 of it', () => {
    const term = { termStart: '2026-03-15', termEnd: termEnd('2026-03-15'), oldPriceCents: 19_900, newPriceCents: 29_900 };
    expect(prorateTierChange({ ...term, changeDate: '2026-03-15' })).toBe(10_000);
    // 10000 × 1 / 365 = 27.4 ¢ → 27 ¢
    expect(prorateTierChange({ ...term, changeDate: '2027-03-14' })).toBe(27);
  });

  it('agrees with a day count from luxon for every day of a term', () => {
    const start = '2026-03-15';
    const end = termEnd(start);
    const s = DateTime.fromISO(start, { zone: 'utc' });
    for (let d = 0; d < 365; d++) {
      const changeDate = s.plus({ days: d }).toISODate()!;
      const cents = prorateTierChange({ termStart: start, termEnd: end, changeDate, oldPriceCents: 0, newPriceCents: 36_500 });
      // 36500 ¢ over 365 days is exactly 100 ¢ per remaining day (arithmetic)
      expect(cents).toBe((365 - d) * 100);
    }
  });

  it('refuses changes outside the term and bad prices', () => {
    const term = { termStart: '2026-01-01', termEnd: '2027-01-01', oldPriceCents: 19_900, newPriceCents: 29_900 };
    expect(() => prorateTierChange({ ...term, changeDate: '2027-01-01' })).toThrow(/changeDate/);
    expect(() => prorateTierChange({ ...term, changeDate: '2025-12-31' })).toThrow(/changeDate/);
    expect(() => prorateTierChange({ ...term, changeDate: '2026-05-01', newPriceCents: 299.5 })).toThrow(/newPriceCents/);
    expect(() => prorateTierChange({ ...term, termEnd: '2026-01-01', changeDate: '2026-01-01' })).toThrow(/termEnd/);
  });
});
