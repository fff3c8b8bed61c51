import * as z from 'zod';
import { seasonMonthIssue, seasonSettingsIssue, type SeasonMonthField, type SeasonSettings } from '../seasons';

const clock = z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$/, 'Use a time like 07:30.');
const day = z
  .object({ open: clock, close: clock })
  .nullable()
  .refine((d) => d === null || d.open < d.close, 'Opening time must be before closing time.');

function validZone(name: string): boolean {
  try {
    new Intl.DateTimeFormat('en-US', { timeZone: name });
    return true;
  } catch {
    return false;
  }
}

/** One season month, checked by seasons.ts's own rule. */
const seasonMonth = (field: SeasonMonthField) =>
  z.custom<number>().superRefine((value, ctx) => {
    const message = seasonMonthIssue(field, value);
    if (message) ctx.addIssue({ code: 'custom', message });
  });

/** The owner's season months, for the API: seasonSettingsIssue as a schema, its problem under its field. */
export const seasonSettingsSchema = z.custom<SeasonSettings>().superRefine((value, ctx) => {
  const issue = seasonSettingsIssue(value);
  if (issue) ctx.addIssue({ code: 'custom', path: [issue.field], message: issue.message });
});

/**
 * The company's details and booking rules, set by the owner. The season months are optional on a
 * change (left out, they stay as they are); the service checks the pair with seasonSettingsSchema.
 */
export const companySettingsSchema = z.object({
  name: z.string().trim().min(1, 'Company name is required.').max(120, 'Company name is at most 120 characters.'),
  phone: z
    .string()
    .trim()
    .regex(/^\+[1-9]\d{6,14}$/, 'Phone in international form, for example +18165550142.'),
  email: z.email('E-mail address is not valid.'),
  street: z.string().trim().min(1, 'Street is required.'),
  city: z.string().trim().min(1, 'City is required.'),
  state: z
    .string()
    .trim()
    .toUpperCase()
    .regex(/^[A-Z]{2}$/, 'State is the two-letter code, for example MO.'),
  zip: z
    .string()
    .trim()
    .regex(/^\d{5}(-\d{4})?$/, 'ZIP code has 5 digits (or ZIP+4).'),
  timeZone: z.string().refine(validZone, 'Time zone is not one we know, for example America/Chicago.'),
  taxRateBps: z.number().int('Sales tax is a whole number of basis points.').min(0, 'Sales tax cannot be negative.').max(5000, 'Sales tax is at most 50 %.'),
  businessHours: z.object({ '1': day, '2': day, '3': day, '4': day, '5': day, '6': day, '7': day }),
  arrivalWindowMinutes: z
    .number()
    .int()
    .min(30, 'Arrival windows are at least 30 minutes.')
    .max(480, 'Arrival windows are at most 8 hours.')
    .multipleOf(30, 'Arrival windows are in steps of 30 minutes.'),
  leadTimeMinutes: z.number().int().min(0, 'Lead time cannot be negative.').max(10080, 'Lead time is at most a week.'),
  heldBackPct: z.number().int().min(0, 'Held-back share is 0–100 %.').max(100, 'Held-back share is 0–100 %.'),
  cancelCutoffHours: z.number().int().min(0, 'Cut-off cannot be negative.').max(168, 'Cut-off is at most a week.'),
  diagnosticFeeCents: z.number().int('Diagnostic fee is in whole cents.').min(0, 'Diagnostic fee cannot be negative.').max(100000, 'Diagnostic fee is at most $1,000.'),
  coolingStartMonth: seasonMonth('coolingStartMonth').optional(),
  heatingStartMonth: seasonMonth('heatingStartMonth').optional(),
});
export type CompanySettingsInput = z.infer<typeof companySettingsSchema>;
/** The settings as the API answers them: the season months always present. */
export type CompanySettings = CompanySettingsInput & { coolingStartMonth: number; heatingStartMonth: number };
