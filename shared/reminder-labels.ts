// The kinds of reminder and the household factors with their words, with neither luxon nor zod,
// so the portal and office pages can list them without the date rules in reminders.ts and
// seasonal-reminders.ts (which re-export everything here).

export const REMINDER_KINDS = ['cooling_tune_up', 'heating_tune_up', 'filter', 'coil_cleaning', 'condensate_drain'] as const;
export type ReminderKind = (typeof REMINDER_KINDS)[number];

export const REMINDER_LABELS: Record<ReminderKind, string> = {
  cooling_tune_up: 'Spring cooling tune-up',
  heating_tune_up: 'Fall heating tune-up',
  filter: 'Filter change',
  coil_cleaning: 'Outdoor coil cleaning',
  condensate_drain: 'Condensate drain service',
};

export const HOUSEHOLD_FACTORS = ['pets', 'allergies', 'smokers', 'renovation_dust'] as const;
export type HouseholdFactor = (typeof HOUSEHOLD_FACTORS)[number];

export const HOUSEHOLD_FACTOR_LABELS: Record<HouseholdFactor, string> = {
  pets: 'Pets in the home',
  allergies: 'Someone with allergies or asthma',
  smokers: 'Someone smokes indoors',
  renovation_dust: 'Renovation or construction dust',
};

/** "due in 5 days", "due today", "3 days overdue". */
export function dueWords(inDays: number): string {
  if (inDays === 0) return 'due today';
  if (inDays > 0) return `due in ${inDays} day${inDays === 1 ? '' : 's'}`;
  return `${-inDays} day${inDays === -1 ? '' : 's'} overdue`;
}
