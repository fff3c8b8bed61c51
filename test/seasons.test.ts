import { DateTime } from 'luxon';
import { describe, expect, it } from 'vitest';
import { coverageFor, tuneUpSeasonOf } from '../shared/coverage';
import { tuneUpChecklistOn } from '../shared/hvac';
import { seasonOf as reminderSeason } from '../shared/seasonal-reminders';
import { DEFAULT_SEASON_SETTINGS, SeasonInputError, seasonMonths, seasonOf, seasonOfMonth, seasonSettingsIssue, type Season, type SeasonSettings } from '../shared/seasons';
import { companySettingsSchema, seasonSettingsSchema } from '../shared/schemas/settings';

const zone = 'America/Chicago';
const iso = (year: number, month: number, day = 15) => `${year}-${String(month).padStart(2, '0')}-${String(day).padStart(2, '0')}`;

/** The season each of the three parts of the product puts a date in. */
function seasonsAt(date: string, settings?: SeasonSettings): { coverage: Season; reminders: Season; checklist: Season } {
  const today = DateTime.fromISO(date, { zone });
  const inside = (['cooling', 'heating'] as const).filter((kind) => {
    const { start, end } = reminderSeason(kind, today, settings);
    return today >= start && today <= end;
  });
  expect(inside, date).toHaveLength(1);
  const visit = { id: 'v', kind: 'tune_up' as const, status: 'scheduled', onDate: date };
  const c = coverageFor({ agreement: null, visit, termVisits: [visit], diagnosticFeeCents: 0, seasons: settings });
  expect(c.tuneUpSeason).toBe(tuneUpSeasonOf(date, settings));
  return { coverage: c.tuneUpSeason!, reminders: inside[0]!, checklist: tuneUpChecklistOn('condensing_unit', date, { seasons: settings }).season };
}

describe('one season table', () => {
  it('puts each of the twelve months in the same season for coverage, reminders and checklists', () => {
    // Default months: cooling March–August, heating September–February (common practice: cool in spring, heat in fall).
    const expected: Season[] = ['heating', 'heating', 'cooling', 'cooling', 'cooling', 'cooling', 'cooling', 'cooling', 'heating', 'heating', 'heating', 'heating'];
    for (let m = 1; m <= 12; m++) {
      for (const day of [1, 15, 28]) {
        const date = iso(2026, m, day);
        expect(seasonsAt(date), date).toEqual({ coverage: expected[m - 1], reminders: expected[m - 1], checklist: expected[m - 1] });
        expect(seasonOf(date)).toBe(expected[m - 1]);
      }
    }
  });

  it('follows the owner’s months in all three', () => {
    // A southern company: cooling from February, heating from November.
    const south = { coolingStartMonth: 2, heatingStartMonth: 11 };
    for (let m = 1; m <= 12; m++) {
      const want: Season = m >= 2 && m <= 10 ? 'cooling' : 'heating';
      expect(seasonsAt(iso(2026, m), south), `month ${m}`).toEqual({ coverage: want, reminders: want, checklist: want });
    }
    // Heating first in the calendar year works the same way round.
    const odd = { coolingStartMonth: 10, heatingStartMonth: 4 };
    expect(seasonOfMonth(12, odd)).toBe('cooling');
    expect(seasonOfMonth(4, odd)).toBe('heating');
    expect(seasonMonths('cooling', odd)).toEqual({ first: 10, last: 3 });
  });

  it('uses the defaults when unset, and refuses bad months by name', () => {
    expect(seasonMonths('cooling')).toEqual({ first: 3, last: 8 });
    expect(seasonMonths('heating')).toEqual({ first: 9, last: 2 });
    expect(seasonOf('2026-05-01', null)).toBe('cooling');
    expect(seasonOf('2026-05-01', { coolingStartMonth: undefined } as unknown as SeasonSettings)).toBe('cooling');
    expect(DEFAULT_SEASON_SETTINGS).toEqual({ coolingStartMonth: 3, heatingStartMonth: 9 });
    expect(() => seasonOf('2026-05-01', { coolingStartMonth: 13, heatingStartMonth: 9 })).toThrow(SeasonInputError);
    expect(() => seasonOf('2026-05-01', { coolingStartMonth: 5, heatingStartMonth: 5 })).toThrow(/heatingStartMonth/);
    expect(() => seasonOf('May 1')).toThrow(/date/);
    expect(seasonSettingsIssue({ coolingStartMonth: 4, heatingStartMonth: 10 })).toBeNull();
    expect(seasonSettingsIssue({ coolingStartMonth: 4, heatingStartMonth: 4 })).toEqual({
      field: 'heatingStartMonth',
      message: 'Heating must start in a different month from cooling.',
    });
    expect(seasonSettingsIssue({ coolingStartMonth: 0, heatingStartMonth: 9 })).toEqual({ field: 'coolingStartMonth', message: 'Cooling season start is a month from 1 to 12.' });
    expect(seasonSettingsIssue({ coolingStartMonth: 3, heatingStartMonth: 9.5 })?.field).toBe('heatingStartMonth');
    expect(seasonSettingsIssue({ coolingStartMonth: '3', heatingStartMonth: 9 })?.field).toBe('coolingStartMonth');
    expect(seasonSettingsIssue(null)?.field).toBe('coolingStartMonth');
  });

  it('checks the months through the same rule in the API schema', () => {
    expect(seasonSettingsSchema.safeParse({ coolingStartMonth: 4, heatingStartMonth: 10 }).success).toBe(true);
    expect(seasonSettingsSchema.safeParse({ coolingStartMonth: 4, heatingStartMonth: 4 }).error?.issues.map((i) => [i.path, i.message])).toEqual([
      [['heatingStartMonth'], 'Heating must start in a different month from cooling.'],
    ]);
    expect(seasonSettingsSchema.safeParse({ coolingStartMonth: 13, heatingStartMonth: 9 }).error?.issues[0]?.path).toEqual(['coolingStartMonth']);
    expect(companySettingsSchema.shape.heatingStartMonth.safeParse(undefined).success).toBe(true);
    expect(companySettingsSchema.shape.heatingStartMonth.safeParse(0).error?.issues[0]?.message).toBe('Heating season start is a month from 1 to 12.');
  });
});
