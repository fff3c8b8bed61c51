import type { AgreementTermView } from './plans';
import { parsePhoneNumberFromString } from 'libphonenumber-js';
import * as z from 'zod';
import { blankToUndefined, pageFields, sortFields } from './lists';
import type { Equipment } from './equipment';
import { US_STATES, IMPORT_FIELDS } from '../customer-fields';
import { emailSchema } from './email';
export { emailSchema } from './email';
export { US_STATES, type UsState, IMPORT_FIELDS } from '../customer-fields';

// The API contract for households, properties, contacts, notes and files. The server parses every
// request with these schemas; the client uses the same ones for instant feedback.

export const NOTE_AUDIENCES = ['office', 'technician'] as const;
export type NoteAudience = (typeof NOTE_AUDIENCES)[number];

export const FILE_CATEGORIES = ['nameplate', 'problem', 'document', 'other'] as const;
export type FileCategory = (typeof FILE_CATEGORIES)[number];
export const FILE_CATEGORY_LABELS: Record<FileCategory, string> = {
  nameplate: 'Nameplate photo',
  problem: 'Problem photo',
  document: 'Document',
  other: 'Other',
};

/** Empty strings from forms and CSV cells count as "not given". */
const blankToNull = (v: unknown) => (v === undefined || (typeof v === 'string' && v.trim() === '') ? null : v);

const text = (label: string, max: number) =>
  z
    .string({ error: `${label} must be text.` })
    .trim()
    .max(max, `Keep ${label.toLowerCase()} under ${max} characters.`);

export const nameSchema = z.string({ error: 'Enter a name.' }).trim().min(1, 'Enter a name.').max(120, 'Keep the name under 120 characters.');

/** Parses a US (or +country) phone number and returns it in E.164, e.g. +18165550142. */
export function toE164(input: string): string | null {
  const parsed = parsePhoneNumberFromString(input.trim(), 'US');
  return parsed && parsed.isValid() ? parsed.number : null;
}

export const phoneSchema = z
  .string({ error: 'Enter a phone number.' })
  .trim()
  .max(40, 'That phone number is too long.')
  .transform((v, ctx) => {
    const e164 = toE164(v);
    if (!e164) {
      ctx.addIssue({ code: 'custom', message: 'Enter a valid phone number with area code, like (816) 555-0142.' });
      return z.NEVER;
    }
    return e164;
  });

export const zipSchema = z
  .string({ error: 'Enter a ZIP code.' })
  .trim()
  .regex(/^[0-9]{5}(-[0-9]{4})?$/, 'ZIP code has 5 digits, or ZIP+4 like 64790-1234.');

export const stateSchema = z.preprocess(
  (v) => (typeof v === 'string' ? v.trim().toUpperCase() : v),
  z.enum(US_STATES, { error: 'Choose a US state by its two-letter code, like MO.' }),
);

const optionalEmail = z.preprocess(blankToNull, emailSchema.nullable());
const optionalPhone = z.preprocess(blankToNull, phoneSchema.nullable());

export const propertyInputSchema = z.object({
  label: z.preprocess(blankToUndefined, text('Label', 60).default('Home')),
  street: z.string({ error: 'Enter the street address.' }).trim().min(3, 'Enter the street address.').max(120, 'Keep the street under 120 characters.'),
  unit: z.preprocess(blankToNull, text('Unit', 30).nullable()).default(null),
  city: z.string({ error: 'Enter the city.' }).trim().min(2, 'Enter the city.').max(80, 'Keep the city under 80 characters.'),
  state: stateSchema,
  zip: zipSchema,
  area: z.preprocess(blankToUndefined, text('Service area', 60).default('')),
  accessNotes: z.preprocess(blankToUndefined, text('Access notes', 1000).default('')),
  gateCode: z.preprocess(blankToUndefined, text('Gate code', 40).default('')),
  pets: z.preprocess(blankToUndefined, text('Pets', 200).default('')),
});
export type PropertyInput = z.infer<typeof propertyInputSchema>;
// No defaults on update: a field left out keeps its value.
export const propertyUpdateSchema = z
  .object({
    label: text('Label', 60).min(1, 'Give the property a label, like Home.'),
    street: propertyInputSchema.shape.street,
    unit: z.preprocess(blankToNull, text('Unit', 30).nullable()),
    city: propertyInputSchema.shape.city,
    state: stateSchema,
    zip: zipSchema,
    area: text('Service area', 60),
    accessNotes: text('Access notes', 1000),
    gateCode: text('Gate code', 40),
    pets: text('Pets', 200),
  })
  .partial()
  .refine((c) => Object.keys(c).length > 0, { error: 'Send at least one field to change.' });
export type PropertyUpdate = z.infer<typeof propertyUpdateSchema>;

const customerFields = {
  name: nameSchema,
  email: optionalEmail.default(null),
  phone: optionalPhone.default(null),
  notes: z.preprocess(blankToUndefined, text('Notes', 4000).default('')),
};

export const customerCreateSchema = z
  .object({
    ...customerFields,
    /** The first property, so a new household can be booked straight away. */
    property: propertyInputSchema.optional(),
  })
  .refine((c) => c.email !== null || c.phone !== null, { error: 'Give an e-mail address or a phone number so we can reach the household.', path: ['email'] });
export type CustomerCreate = z.infer<typeof customerCreateSchema>;

export const customerUpdateSchema = z
  .object({ name: nameSchema, email: optionalEmail, phone: optionalPhone, notes: text('Notes', 4000) })
  .partial()
  .refine((c) => Object.keys(c).length > 0, { error: 'Send at least one field to change.' });
export type CustomerUpdate = z.infer<typeof customerUpdateSchema>;

export const contactInputSchema = z
  .object({
    name: nameSchema,
    relationship: z.preprocess(blankToUndefined, text('Relationship', 60).default('')),
    email: optionalEmail.default(null),
    phone: optionalPhone.default(null),
    isPrimary: z.boolean({ error: 'Primary is true or false.' }).default(false),
  })
  .refine((c) => c.email !== null || c.phone !== null, { error: 'Give an e-mail address or a phone number for this contact.', path: ['email'] });
export type ContactInput = z.infer<typeof contactInputSchema>;

export const noteInputSchema = z.object({
  body: z.string({ error: 'Write the note.' }).trim().min(1, 'Write the note.').max(4000, 'Keep the note under 4000 characters.'),
  propertyId: z.preprocess(blankToNull, z.uuid({ error: 'Choose one of the household’s properties.' }).nullable()).default(null),
  audience: z.enum(NOTE_AUDIENCES, { error: 'Audience is office or technician.' }).default('office'),
});
export type NoteInput = z.infer<typeof noteInputSchema>;

export const mergeSchema = z.object({
  sourceId: z.uuid({ error: 'Choose the duplicate household to merge in.' }),
});

export const CUSTOMER_SORTS = ['name', 'email', 'createdAt', 'city'] as const;
export const customerListQuerySchema = z.object({
  q: z.preprocess(blankToUndefined, z.string().trim().max(100, 'Keep the search under 100 characters.').optional()),
  ...sortFields(CUSTOMER_SORTS, 'name'),
  ...pageFields,
  status: z.enum(['active', 'archived', 'all'], { error: 'Status is active, archived or all.' }).default('active'),
});
export type CustomerListQuery = z.infer<typeof customerListQuerySchema>;

// ---- Responses ----

export const customerSummarySchema = z.object({
  id: z.uuid(),
  name: z.string(),
  email: z.string().nullable(),
  phone: z.string().nullable(),
  street: z.string().nullable(),
  city: z.string().nullable(),
  propertyCount: z.number().int(),
  archived: z.boolean(),
  createdAt: z.string(),
});
export type CustomerSummary = z.infer<typeof customerSummarySchema>;

export const customerPageSchema = z.object({
  items: z.array(customerSummarySchema),
  total: z.number().int(),
  page: z.number().int(),
  pageSize: z.number().int(),
});
export type CustomerPage = z.infer<typeof customerPageSchema>;

export const propertySchema = z.object({
  id: z.uuid(),
  customerId: z.uuid(),
  label: z.string(),
  street: z.string(),
  unit: z.string().nullable(),
  city: z.string(),
  state: z.string(),
  zip: z.string(),
  area: z.string(),
  accessNotes: z.string(),
  gateCode: z.string(),
  pets: z.string(),
  archived: z.boolean(),
});
export type Property = z.infer<typeof propertySchema>;

export const contactSchema = z.object({
  id: z.uuid(),
  name: z.string(),
  relationship: z.string(),
  email: z.string().nullable(),
  phone: z.string().nullable(),
  isPrimary: z.boolean(),
});
export type Contact = z.infer<typeof contactSchema>;

export const fileSchema = z.object({
  id: z.uuid(),
  category: z.enum(FILE_CATEGORIES),
  contentType: z.string(),
  originalName: z.string(),
  sizeBytes: z.number().int(),
  width: z.number().int().nullable(),
  height: z.number().int().nullable(),
  caption: z.string(),
  propertyId: z.uuid().nullable(),
  equipmentId: z.uuid().nullable(),
  visitId: z.uuid().nullable(),
  url: z.string(),
  thumbUrl: z.string().nullable(),
  createdAt: z.string(),
});
export type StoredFile = z.infer<typeof fileSchema>;

export const TIMELINE_KINDS = ['created', 'property', 'equipment', 'agreement', 'visit', 'invoice', 'note', 'file', 'contact', 'merged', 'archived'] as const;
export type TimelineKind = (typeof TIMELINE_KINDS)[number];
export const timelineEntrySchema = z.object({
  at: z.string(),
  kind: z.enum(TIMELINE_KINDS),
  title: z.string(),
  detail: z.string(),
  refId: z.string().nullable(),
});
export type TimelineEntry = z.infer<typeof timelineEntrySchema>;

export const noteSchema = z.object({
  id: z.uuid(),
  body: z.string(),
  audience: z.enum(NOTE_AUDIENCES),
  propertyId: z.uuid().nullable(),
  authorName: z.string().nullable(),
  createdAt: z.string(),
});
export type Note = z.infer<typeof noteSchema>;

/** One household with everything recorded about it, and one timeline across those records. */
export interface CustomerDetail {
  id: string;
  name: string;
  email: string | null;
  phone: string | null;
  notes: string;
  archived: boolean;
  mergedIntoId: string | null;
  createdAt: string;
  contacts: Contact[];
  properties: (Property & { equipment: Equipment[] })[];
  agreements: {
    id: string;
    propertyId: string;
    plan: string;
    status: string;
    statusLabel: string;
    startsOn: string;
    endsOn: string;
    lastDayLabel: string;
    priceCents: number;
    terms: AgreementTermView[];
  }[];
  /** windowMissed: the window passed and the visit was never started (windowMissed in shared/visits.ts). */
  visits: {
    id: string;
    propertyId: string;
    kind: string;
    reason: string;
    reasonLabel: string;
    status: string;
    statusLabel: string;
    startsAt: string;
    windowStart: string;
    windowEnd: string;
    windowMissed: boolean;
    findings: string;
    recommendations: string;
    technicianName: string | null;
  }[];
  invoices: { id: string; number: number | null; status: string; totalCents: number; paidCents: number; issuedAt: string | null; createdAt: string }[];
  householdNotes: Note[];
  files: StoredFile[];
  timeline: TimelineEntry[];
}

/** What a homeowner may change about their own household. */
export const homeContactSchema = z
  .object({ name: nameSchema, email: optionalEmail, phone: optionalPhone })
  .partial()
  .refine((c) => Object.keys(c).length > 0, { error: 'Send at least one field to change.' });
export type HomeContact = z.infer<typeof homeContactSchema>;

/** What the technician should know at the door, kept by the homeowner. */
export const homeAccessSchema = z
  .object({
    accessNotes: text('Access notes', 1000),
    gateCode: text('Gate code', 40),
    pets: text('Pets', 200),
  })
  .partial()
  .refine((c) => Object.keys(c).length > 0, { error: 'Send at least one field to change.' });
export type HomeAccess = z.infer<typeof homeAccessSchema>;

export const homeNoteSchema = z.object({
  body: z.string({ error: 'Write the note.' }).trim().min(1, 'Write the note.').max(2000, 'Keep the note under 2000 characters.'),
  propertyId: z.uuid({ error: 'Choose which home the note is about.' }),
});

export interface MyHomeVisit {
  id: string;
  propertyId: string;
  reasonLabel: string;
  statusLabel: string;
  status: string;
  startsAt: string;
  windowStart: string;
  windowEnd: string;
  findings: string;
  recommendations: string;
  technicianName: string | null;
}

export interface MyHome {
  household: { id: string; name: string; email: string | null; phone: string | null };
  properties: (Property & { equipment: Equipment[] })[];
  /** Grouped with groupServiceHistory (shared/visits.ts): coming up soonest first, past newest first. */
  upcoming: MyHomeVisit[];
  past: MyHomeVisit[];
  files: StoredFile[];
  notes: Note[];
}

// ---- CSV import and export: one row per piece of equipment, with its household and property ----

export type ImportFieldKey = (typeof IMPORT_FIELDS)[number]['key'];
export const IMPORT_FIELD_KEYS = IMPORT_FIELDS.map((f) => f.key) as ImportFieldKey[];

/** For each of our fields, the CSV column it reads from (or null to leave it out). */
export const importMappingSchema = z.record(z.string(), z.string().nullable()).superRefine((m, ctx) => {
  for (const key of Object.keys(m)) {
    if (!(IMPORT_FIELD_KEYS as string[]).includes(key)) ctx.addIssue({ code: 'custom', path: [key], message: `${key} is not an import field.` });
  }
  for (const f of IMPORT_FIELDS) {
    if (f.required && !m[f.key]) ctx.addIssue({ code: 'custom', path: [f.key], message: `Choose the column that holds ${f.label.toLowerCase()}.` });
  }
});
export type ImportMapping = Record<string, string | null>;

export interface ImportPreview {
  headers: string[];
  sample: Record<string, string>[];
  rowCount: number;
  mapping: ImportMapping;
}

export interface ImportProblem {
  /** Spreadsheet row number: the header is row 1, the first household row 2. */
  row: number;
  /** The CSV column as the file names it (or our field name when it is not mapped). */
  column: string;
  field: ImportFieldKey | '_';
  message: string;
}

export interface ImportCounts {
  customers: { created: number; matched: number };
  properties: { created: number; matched: number };
  equipment: { created: number; matched: number };
}

export interface ImportCheck {
  valid: boolean;
  rowCount: number;
  problems: ImportProblem[];
  counts: ImportCounts | null;
}
