// Which months are cooling season and which are heating season. One table for the whole product:
// coverage counts tune-ups by it, reminders aim at it, and the checklist picks its items by it.

export type Season = 'cooling' | 'heating';
export const SEASONS: readonly Season[] = ['cooling', 'heating'];

/**
 * The owner's choice, as two months (1–12): the cooling season runs from its first month up to the
 * month before heating starts, and heating runs round to the month before cooling starts again, so
 * every month is in exactly one season.
 */
export interface SeasonSettings {
  coolingStartMonth: number;
  heatingStartMonth: number;
}

/** Cooling tune-ups from March, heating tune-ups from September (common practice: cool in spring, heat in fall). */
export const DEFAULT_SEASON_SETTINGS: Readonly<SeasonSettings> = { coolingStartMonth: 3, heatingStartMonth: 9 };

/** The two months of SeasonSettings, with the words a problem with each is named by. */
export const SEASON_MONTH_LABELS = {
  coolingStartMonth: 'Cooling season start',
  heatingStartMonth: 'Heating season start',
} as const satisfies Record<keyof SeasonSettings, string>;
export type SeasonMonthField = keyof typeof SEASON_MONTH_LABELS;

/** What is wrong with one season month (a whole number from 1 to 12), or null. */
export function seasonMonthIssue(field: SeasonMonthField, value: unknown): string | null {
  return typeof value === 'number' && Number.isInteger(value) && value >= 1 && value <= 12 ? null : `${SEASON_MONTH_LABELS[field]} is a month from 1 to 12.`;
}

/**
 * The one check of the owner's season months: the first problem, named by its field, or null.
 * Both are months from 1 to 12 and heating starts in another month than cooling. Plain code, no
 * zod, so that pages reading seasons stay light; seasonSettingsSchema (schemas/settings.ts) is
 * built on it for the API.
 */
export function seasonSettingsIssue(settings: unknown): { field: SeasonMonthField; message: string } | null {
  const s = (typeof settings === 'object' && settings !== null ? settings : {}) as Partial<Record<SeasonMonthField, unknown>>;
  for (const field of Object.keys(SEASON_MONTH_LABELS) as SeasonMonthField[]) {
    const message = seasonMonthIssue(field, s[field]);
    if (message) return { field, message };
  }
  if (s.coolingStartMonth === s.heatingStartMonth) return { field: 'heatingStartMonth', message: 'Heating must start in a different month from cooling.' };
  return null;
}

export class SeasonInputError extends Error {
  constructor(
    readonly field: string,
    message: string,
  ) {
    super(`${field}: ${message}`);
    this.name = 'SeasonInputError';
  }
}

function settingsOrDefault(settings: Partial<SeasonSettings> | null | undefined): SeasonSettings {
  const s = { ...DEFAULT_SEASON_SETTINGS, ...Object.fromEntries(Object.entries(settings ?? {}).filter(([, v]) => v !== undefined && v !== null)) };
  const issue = seasonSettingsIssue(s);
  if (issue) throw new SeasonInputError(issue.field, issue.message);
  const { coolingStartMonth, heatingStartMonth } = s as SeasonSettings;
  return { coolingStartMonth, heatingStartMonth };
}

/** The season a month (1–12) belongs to. */
export function seasonOfMonth(month: number, settings?: Partial<SeasonSettings> | null): Season {
  if (!Number.isInteger(month) || month < 1 || month > 12) throw new SeasonInputError('month', `must be a month from 1 to 12, got ${String(month)}`);
  const { coolingStartMonth: c, heatingStartMonth: h } = settingsOrDefault(settings);
  // Months counted from the start of cooling: cooling covers the first (h − c) mod 12 of them.
  const fromCooling = (month - c + 12) % 12;
  return fromCooling < (h - c + 12) % 12 ? 'cooling' : 'heating';
}

const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})/;

/** The season a local date ("2026-10-20", or a longer ISO string starting with the date) falls in. */
export function seasonOf(date: string, settings?: Partial<SeasonSettings> | null): Season {
  const m = typeof date === 'string' ? ISO_DATE.exec(date) : null;
  if (!m) throw new SeasonInputError('date', `must be a date as YYYY-MM-DD, got ${String(date)}`);
  return seasonOfMonth(Number(m[2]), settings);
}

/**
 * The months of a season as first and last month (1–12); `last` is before `first` when the season
 * runs over New Year (heating from September to February).
 */
export function seasonMonths(season: Season, settings?: Partial<SeasonSettings> | null): { first: number; last: number } {
  const s = settingsOrDefault(settings);
  const first = season === 'cooling' ? s.coolingStartMonth : s.heatingStartMonth;
  const next = season === 'cooling' ? s.heatingStartMonth : s.coolingStartMonth;
  return { first, last: ((next + 10) % 12) + 1 };
}
