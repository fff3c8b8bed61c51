import * as z from 'zod';
import { blankToUndefined, pageFields, sortFields } from './lists';
import { REFRIGERANTS } from '../equipment';
import {
  ITEM_CATEGORIES,
  ITEM_CATEGORY_KIND,
  ITEM_CATEGORY_LABELS,
  ITEM_KINDS,
  ITEM_UNITS,
  LINE_MAX_CENTS,
  LINES_PER_OPTION_MAX,
  OPTIONS_PER_QUOTE_MAX,
  PLAIN_PART_CATEGORIES,
  QUANTITY_MAX,
  formatHorsepower,
  parseHorsepower,
  parseVoltRanges,
  type ItemCategory,
  type ItemKind,
} from '../pricebook';
import type { ImportMapping, ImportPreview, ImportProblem } from './customers';
import { emailSchema } from './email';
import { filterSizeSchema } from './equipment';
import {
  DEFAULT_CAPACITOR_TOLERANCE_PCT,
  MOTOR_APPLICATIONS,
  QUOTE_STATUSES,
  SPEED_TAPS,
  type QuoteStatus,
  PRICE_BOOK_IMPORT_FIELDS,
  type PriceBookFieldKey,
  PRICE_BOOK_FIELD_KEYS,
} from '../pricebook';
export {
  DEFAULT_CAPACITOR_TOLERANCE_PCT,
  SPEED_TAPS,
  type SpeedTap,
  MOTOR_APPLICATIONS,
  type MotorApplication,
  MOTOR_APPLICATION_LABELS,
  QUOTE_STATUSES,
  type QuoteStatus,
  QUOTE_STATUS_LABELS,
  EDITABLE_QUOTE_STATUSES,
  PRICE_BOOK_IMPORT_FIELDS,
  type PriceBookFieldKey,
  PRICE_BOOK_FIELD_KEYS,
} from '../pricebook';

// The API contract for the price book, quotes, truck stock and invoicing work without a quote.
// Money is integer cents with a stated maximum; the server parses every request with these and
// the client uses the same ones for instant feedback.

const blankToNull = (v: unknown) => (v === undefined || (typeof v === 'string' && v.trim() === '') ? null : v);
const numberish = (v: unknown) => (typeof v === 'string' && v.trim() !== '' ? Number(v.trim().replace(/,/g, '')) : v);

const text = (label: string, max: number) =>
  z
    .string({ error: `${label} must be text.` })
    .trim()
    .max(max, `Keep ${label.toLowerCase()} under ${max} characters.`);

const id = (message: string) => z.uuid({ error: message });

/** Whole cents from 0 up to `max`, with the limit said in dollars. */
export const centsSchema = (label: string, max = LINE_MAX_CENTS) =>
  z
    .number({ error: `${label} must be a number of cents.` })
    .int(`${label} must be whole cents.`)
    .min(0, `${label} must not be negative.`)
    .max(max, `${label} can be at most $${(max / 100).toLocaleString('en-US', { minimumFractionDigits: 2 })}.`);

const amount = (label: string, min: number, max: number, unit: string) =>
  z.preprocess(
    numberish,
    z
      .number({ error: `${label} is a number.` })
      .refine(Number.isFinite, `${label} is a number.`)
      .min(min, `${label} is at least ${min}${unit}.`)
      .max(max, `${label} is at most ${max}${unit}.`),
  );

const wholeNumber = (label: string, min: number, max: number) =>
  z.preprocess(
    numberish,
    z
      .number({ error: `${label} is a number.` })
      .int(`${label} is a whole number.`)
      .min(min, `${label} is at least ${min}.`)
      .max(max, `${label} is at most ${max}.`),
  );

export const quantitySchema = z.preprocess(
  numberish,
  z
    .number({ error: 'Quantity must be a number.' })
    .positive('Quantity must be more than 0.')
    .max(QUANTITY_MAX, `Quantity is at most ${QUANTITY_MAX}.`)
    .refine((q) => Math.abs(Math.round(q * 1000) - q * 1000) < 1e-6, 'Quantity allows at most 3 decimals.'),
);

/** The most of one part a location holds; a restock or transfer past it is refused. */
export const STOCK_MAX = 9999;

const stockCount = (label: string, min: number) => wholeNumber(label, min, STOCK_MAX);

// ---- Part specifications, one schema per category ----

const horsepowerValue = (label: string) =>
  z.preprocess(
    (v) => parseHorsepower(v) ?? v,
    z
      .number({ error: `${label} is a number like 1/3 or 0.5.` })
      .positive(`${label} is more than 0.`)
      .max(10, `${label} is at most 10 hp for a part on the truck.`),
  );

/** One horsepower, or the range of a multi-horsepower motor ("1/6-1/2"); always stored as a range. */
const horsepowerRange = z.preprocess(
  (v) => {
    if (typeof v === 'string' && /[-–]/.test(v.replace(/^\s*-/, ''))) {
      const [a, b] = v.split(/\s*[-–]\s*/);
      return { min: a, max: b };
    }
    return typeof v === 'object' && v !== null ? v : { min: v, max: v };
  },
  z
    .object({ min: horsepowerValue('Horsepower'), max: horsepowerValue('Horsepower') }, { error: 'Horsepower is a value like 1/3, or a range like 1/6-1/2.' })
    .refine((r) => r.max >= r.min, { error: 'Horsepower range goes from the smaller to the larger value.', path: ['max'] }),
);

/** Voltage ratings as ranges: 230, "208-230", "115/208-230", or a list of those. */
const voltRanges = (label: string) =>
  z.preprocess(
    (v) => {
      if (Array.isArray(v)) return v.flatMap((x) => (typeof x === 'object' && x !== null ? [x] : (parseVoltRanges(x) ?? [x])));
      // Unreadable text becomes "missing", so the one message says what a rating looks like.
      return typeof v === 'string' ? (parseVoltRanges(v) ?? undefined) : (parseVoltRanges(v) ?? v);
    },
    z
      .array(
        z
          .object({ min: wholeNumber(label, 12, 600), max: wholeNumber(label, 12, 600) }, { error: `${label} is a voltage like 230, or a span like 208-230.` })
          .refine((r) => r.max >= r.min, { error: `${label} span goes from the lower to the higher voltage.`, path: ['max'] }),
        { error: `${label} is a voltage like 230, or a span like 208-230.` },
      )
      .min(1, `Give ${label.toLowerCase()}.`)
      .max(3, `${label} lists at most 3 ratings.`),
  );

export const PHASES = [1, 3] as const;
const phaseSchema = z.preprocess(numberish, z.union([z.literal(1), z.literal(3)], { error: 'Phase is 1 or 3.' }));

export const ROTATIONS = ['reversible', 'cw', 'ccw'] as const;
export type Rotation = (typeof ROTATIONS)[number];
/** Which end the rotation is seen from: nameplates use either, so it is always recorded. */
export const ROTATION_VIEWS = ['shaft_end', 'lead_end'] as const;
export type RotationView = (typeof ROTATION_VIEWS)[number];
export const ROTATION_LABELS: Record<Rotation, string> = { reversible: 'Reversible', cw: 'Clockwise (CW)', ccw: 'Counter-clockwise (CCW)' };

const lowerWord = (v: unknown) =>
  typeof v === 'string'
    ? v
        .trim()
        .toLowerCase()
        .replace(/[\s-]+/g, '_')
    : v;

const shaftSchema = z.object(
  {
    diameterIn: amount('Shaft diameter', 0.25, 1.5, ' in'),
    lengthIn: amount('Shaft length', 0.5, 12, ' in'),
  },
  { error: 'Shaft is its diameter and length in inches.' },
);

const tapSchema = z.object(
  {
    horsepower: horsepowerValue('Tap horsepower'),
    microfarads: amount('Capacitor µF', 1, 100, ' µF'),
    /** Full-load amps on this tap, when the nameplate lists them per tap. */
    amps: z
      .preprocess((v) => numberish(blankToNull(v)), z.number({ error: 'Tap amps is a number.' }).positive('Tap amps is more than 0.').max(60, 'Tap amps is at most 60.').nullable())
      .default(null),
  },
  { error: 'Each horsepower tap has its horsepower and the capacitor µF it needs.' },
);

export const motorSpecSchema = z
  .object({
    category: z.literal('motor'),
    application: z.preprocess(lowerWord, z.enum(MOTOR_APPLICATIONS, { error: 'Use is indoor blower, condenser fan, draft inducer or other.' })).default('other'),
    horsepower: horsepowerRange,
    volts: voltRanges('Volts'),
    phase: phaseSchema,
    rpm: wholeNumber('RPM', 300, 3600),
    speeds: wholeNumber('Speeds', 1, 5),
    rotation: z.preprocess(lowerWord, z.enum(ROTATIONS, { error: 'Rotation is reversible, CW or CCW.' })),
    /** Required for a fixed rotation: CW seen from the shaft end is CCW seen from the lead end. */
    rotationViewedFrom: z
      .preprocess((v) => blankToNull(lowerWord(v)), z.enum(ROTATION_VIEWS, { error: 'Say whether rotation is seen from the shaft end or the lead end.' }).nullable())
      .default(null),
    shaft: shaftSchema.nullable().default(null),
    frame: z
      .preprocess(
        blankToNull,
        text('Frame', 10)
          .regex(/^[0-9A-Z.]+$/i, 'Frame is a size like 48 or 56.')
          .nullable(),
      )
      .default(null),
    /** Full-load amps at the highest horsepower. */
    fla: amount('Rated amps (FLA)', 0.1, 60, ' A'),
    /** Run-capacitor µF per horsepower tap; empty for motors without one (ECM, shaded pole). */
    taps: z.array(tapSchema, { error: 'Horsepower taps are a list.' }).max(6, 'List at most 6 horsepower taps.').default([]),
    capacitorVolts: z
      .preprocess(
        (v) => numberish(blankToNull(v)),
        z
          .number({ error: 'Capacitor volts is a number.' })
          .int('Capacitor volts is a whole number.')
          .min(110, 'Capacitor volts is at least 110.')
          .max(600, 'Capacitor volts is at most 600.')
          .nullable(),
      )
      .default(null),
  })
  .superRefine((m, ctx) => {
    if (m.rotation !== 'reversible' && !m.rotationViewedFrom)
      ctx.addIssue({ code: 'custom', path: ['rotationViewedFrom'], message: 'Say whether rotation is seen from the shaft end or the lead end.' });
    m.taps.forEach((t, i) => {
      if (m.horsepower.max >= m.horsepower.min && (t.horsepower < m.horsepower.min - 0.002 || t.horsepower > m.horsepower.max + 0.002)) {
        ctx.addIssue({ code: 'custom', path: ['taps', i, 'horsepower'], message: `Tap ${formatHorsepower(t.horsepower)} is outside the motor's horsepower.` });
      }
      if (m.taps.findIndex((o) => Math.abs(o.horsepower - t.horsepower) < 0.002) !== i)
        ctx.addIssue({ code: 'custom', path: ['taps', i, 'horsepower'], message: `Tap ${formatHorsepower(t.horsepower)} is listed twice.` });
    });
    if (m.taps.length && m.capacitorVolts === null)
      ctx.addIssue({ code: 'custom', path: ['capacitorVolts'], message: 'Give the capacitor volts (370 or 440) for the horsepower taps.' });
  });
export type MotorSpec = z.infer<typeof motorSpecSchema>;

/** "40/5", "45+5", "7.5" → capacitor sections in µF (herm first on a dual can). */
const sectionsSchema = z.preprocess(
  (v) =>
    typeof v === 'string'
      ? v
          .replace(/\s*(µ|u|m)?f(d)?\s*$/i, '')
          .split(/\s*[/+]\s*/)
          .map(numberish)
      : typeof v === 'number'
        ? [v]
        : v,
  z
    .array(amount('Capacitor µF', 0.5, 100, ' µF'), { error: 'µF is a value like 7.5, or two like 40/5.' })
    .min(1, 'Give the µF.')
    .max(2, 'A capacitor has one or two sections, like 40/5.'),
);

export const CAPACITOR_SHAPES = ['round', 'oval'] as const;
export type CapacitorShape = (typeof CAPACITOR_SHAPES)[number];

export const capacitorSpecSchema = z.object({
  category: z.literal('capacitor'),
  microfarads: sectionsSchema,
  volts: wholeNumber('Capacitor volts', 110, 600),
  shape: z.preprocess(lowerWord, z.enum(CAPACITOR_SHAPES, { error: 'Shape is round or oval.' })),
  tolerancePct: wholeNumber('Tolerance', 1, 20).default(DEFAULT_CAPACITOR_TOLERANCE_PCT),
});
export type CapacitorSpec = z.infer<typeof capacitorSpecSchema>;

export const contactorSpecSchema = z.object({
  category: z.literal('contactor'),
  poles: wholeNumber('Poles', 1, 4),
  coilVolts: wholeNumber('Coil volts', 12, 600),
  fla: amount('Rated amps (FLA)', 1, 200, ' A'),
});
export type ContactorSpec = z.infer<typeof contactorSpecSchema>;

export const filterSpecSchema = z.object({
  category: z.literal('filter'),
  size: filterSizeSchema.refine((s) => s !== '', 'Give the filter size, like 16x25x1.'),
  merv: wholeNumber('MERV', 1, 16).nullable().default(null),
});
export type FilterSpec = z.infer<typeof filterSpecSchema>;

export const refrigerantSpecSchema = z.object({
  category: z.literal('refrigerant'),
  refrigerant: z.enum(REFRIGERANTS, { error: `Refrigerant is one of ${REFRIGERANTS.join(', ')}.` }),
});
export type RefrigerantSpec = z.infer<typeof refrigerantSpecSchema>;

export const plainPartSpecSchema = z.object({
  category: z.enum(PLAIN_PART_CATEGORIES, { error: 'Choose the part category.' }),
  notes: z.preprocess(blankToUndefined, text('Spec notes', 500).default('')),
});

/** A part's specification, checked by the schema of its category. */
export const partSpecSchema = z.discriminatedUnion(
  'category',
  [motorSpecSchema, capacitorSpecSchema, contactorSpecSchema, filterSpecSchema, refrigerantSpecSchema, plainPartSpecSchema],
  {
    error: 'Choose the part category for its specification.',
  },
);
export type PartSpec = z.infer<typeof partSpecSchema>;
export type PartSpecInput = z.input<typeof partSpecSchema>;

// ---- Price-book items and flat-rate tasks ----

export const skuSchema = z.preprocess(
  (v) => (typeof v === 'string' ? v.trim().toUpperCase() : v),
  z
    .string({ error: 'Enter the SKU.' })
    .min(1, 'Enter the SKU.')
    .max(40, 'Keep the SKU under 40 characters.')
    .regex(/^[A-Z0-9][A-Z0-9._\-/]*$/, 'SKU uses letters, digits, dots, dashes or slashes.'),
);

const kindSchema = z.enum(ITEM_KINDS, { error: 'Kind is part, labor or fee.' });
const categorySchema = z.enum(ITEM_CATEGORIES, { error: 'Choose a category from the price book.' });

const itemFields = {
  sku: skuSchema,
  name: z.string({ error: 'Enter the item name.' }).trim().min(1, 'Enter the item name.').max(120, 'Keep the item name under 120 characters.'),
  kind: kindSchema,
  category: categorySchema,
  unit: z.enum(ITEM_UNITS, { error: `Unit is one of ${ITEM_UNITS.join(', ')}.` }),
  unitCents: centsSchema('Unit price'),
  costCents: centsSchema('Cost'),
  taxable: z.boolean({ error: 'Say whether the item is taxable.' }),
  partsWarrantyMonths: wholeNumber('Parts warranty', 0, 240),
  spec: partSpecSchema.nullable(),
  active: z.boolean({ error: 'Say whether the item is offered.' }),
};

function checkItem(v: { kind?: ItemKind; category?: ItemCategory; spec?: PartSpec | null; partsWarrantyMonths?: number }, ctx: z.RefinementCtx) {
  if (v.kind && v.category && ITEM_CATEGORY_KIND[v.category] !== v.kind) {
    ctx.addIssue({ code: 'custom', path: ['category'], message: `${ITEM_CATEGORY_LABELS[v.category]} is a ${ITEM_CATEGORY_KIND[v.category]} category, not ${v.kind}.` });
  }
  if (v.spec && v.category && v.spec.category !== v.category)
    ctx.addIssue({
      code: 'custom',
      path: ['spec', 'category'],
      message: `The specification is for a ${v.spec.category}, but the item is a ${ITEM_CATEGORY_LABELS[v.category].toLowerCase()}.`,
    });
  if (v.spec && v.kind && v.kind !== 'part') ctx.addIssue({ code: 'custom', path: ['spec'], message: 'Only parts have a specification.' });
  if (v.kind && v.kind !== 'part' && (v.partsWarrantyMonths ?? 0) > 0)
    ctx.addIssue({ code: 'custom', path: ['partsWarrantyMonths'], message: 'Only parts carry a parts warranty.' });
}

export const priceBookItemInputSchema = z
  .object({
    ...itemFields,
    unit: itemFields.unit.default('each'),
    partsWarrantyMonths: itemFields.partsWarrantyMonths.default(0),
    spec: itemFields.spec.default(null),
    active: itemFields.active.default(true),
  })
  .superRefine(checkItem);
export type PriceBookItemInput = z.infer<typeof priceBookItemInputSchema>;

/** No defaults on update: a field left out keeps its value. A price change writes a new version. */
export const priceBookItemUpdateSchema = z
  .object(itemFields)
  .partial()
  .superRefine(checkItem)
  .refine((c) => Object.keys(c).length > 0, { error: 'Send at least one field to change.' });
export type PriceBookItemUpdate = z.infer<typeof priceBookItemUpdateSchema>;

export const ITEM_SORTS = ['sku', 'name', 'category', 'unitCents'] as const;
export const priceBookListQuerySchema = z.object({
  q: z.preprocess(blankToUndefined, z.string({ error: 'Search is text.' }).trim().max(100, 'Keep the search under 100 characters.').optional()),
  kind: z.preprocess(blankToUndefined, kindSchema.optional()),
  category: z.preprocess(blankToUndefined, categorySchema.optional()),
  status: z.enum(['active', 'inactive', 'all'], { error: 'Status is active, inactive or all.' }).default('active'),
  ...sortFields(ITEM_SORTS, 'sku'),
  ...pageFields,
});
export type PriceBookListQuery = z.infer<typeof priceBookListQuerySchema>;

export const flatRateTaskInputSchema = z.object({
  sku: skuSchema,
  name: z.string({ error: 'Name the task.' }).trim().min(1, 'Name the task, like "Replace run capacitor".').max(120, 'Keep the task name under 120 characters.'),
  /** What the homeowner reads on the quote. */
  description: z.preprocess(blankToUndefined, text('Description', 1000).default('')),
  components: z
    .array(
      z.object({
        itemId: id('Choose a price-book item for the task.'),
        quantity: quantitySchema,
      }),
      { error: 'A task is a list of parts and labor.' },
    )
    .min(1, 'Add at least one part or labor item to the task.')
    .max(20, 'A task has at most 20 items.')
    .refine((cs) => new Set(cs.map((c) => c.itemId)).size === cs.length, 'Each item appears once in a task; raise its quantity instead.'),
  active: z.boolean({ error: 'Say whether the task is offered.' }).default(true),
});
export type FlatRateTaskInput = z.infer<typeof flatRateTaskInputSchema>;
export const flatRateTaskUpdateSchema = flatRateTaskInputSchema.partial().refine((c) => Object.keys(c).length > 0, { error: 'Send at least one field to change.' });
export type FlatRateTaskUpdate = z.infer<typeof flatRateTaskUpdateSchema>;

// ---- Price-book responses ----

export interface PriceBookItem {
  id: string;
  /** The version a quote line keeps: later price changes write a new version. */
  versionId: string;
  version: number;
  sku: string;
  name: string;
  kind: ItemKind;
  category: ItemCategory;
  unit: (typeof ITEM_UNITS)[number];
  unitCents: number;
  costCents: number;
  taxable: boolean;
  partsWarrantyMonths: number;
  spec: PartSpec | null;
  active: boolean;
  updatedAt: string;
}

export interface PriceBookPage {
  items: PriceBookItem[];
  total: number;
  page: number;
  pageSize: number;
}

export interface FlatRateTask {
  id: string;
  versionId: string;
  version: number;
  sku: string;
  name: string;
  description: string;
  components: { itemId: string; itemVersionId: string; sku: string; name: string; kind: ItemKind; category: ItemCategory; quantity: number; unitCents: number; taxable: boolean }[];
  /** The sum of its components at today's prices. */
  priceCents: number;
  active: boolean;
}

// ---- Quotes ----

const equipmentIdField = z.preprocess(blankToNull, id('Choose the system this line is for.').nullable()).default(null);

/** A quote line: from the price book, a flat-rate task, or written out by hand. */
export const quoteLineInputSchema = z.discriminatedUnion(
  'source',
  [
    z.object({
      source: z.literal('item'),
      itemId: id('Choose an item from the price book.'),
      quantity: quantitySchema,
      /** Where the part comes from: this technician's truck, another truck or the shop. */
      stockLocationId: z.preprocess(blankToNull, id('Choose where the part comes from.').nullable()).default(null),
      equipmentId: equipmentIdField,
    }),
    z.object({
      source: z.literal('task'),
      taskId: id('Choose a flat-rate task.'),
      quantity: quantitySchema.refine(Number.isInteger, 'A task is done a whole number of times.'),
      stockLocationId: z.preprocess(blankToNull, id('Choose where the parts come from.').nullable()).default(null),
      equipmentId: equipmentIdField,
    }),
    z
      .object({
        source: z.literal('custom'),
        description: z.string({ error: 'Describe the line.' }).trim().min(1, 'Describe the line.').max(200, 'Keep the description under 200 characters.'),
        kind: kindSchema,
        category: categorySchema,
        quantity: quantitySchema,
        unitCents: centsSchema('Unit price'),
        taxable: z.boolean({ error: 'Say whether the line is taxable.' }),
        equipmentId: equipmentIdField,
      })
      .superRefine((l, ctx) => {
        checkItem(l, ctx);
        if (Math.round(l.quantity * l.unitCents) > LINE_MAX_CENTS) ctx.addIssue({ code: 'custom', path: ['unitCents'], message: 'A line can be at most $999,999.99.' });
      }),
  ],
  { error: 'A line comes from the price book, a flat-rate task, or is written out.' },
);
export type QuoteLineInput = z.infer<typeof quoteLineInputSchema>;

export const quoteOptionInputSchema = z.object({
  title: z.string({ error: 'Name the option.' }).trim().min(1, 'Name the option, like "Replace the motor".').max(80, 'Keep the option name under 80 characters.'),
  description: z.preprocess(blankToUndefined, text('Option description', 1000).default('')),
  lines: z
    .array(quoteLineInputSchema, { error: 'An option is a list of lines.' })
    .min(1, 'Add at least one line to the option.')
    .max(LINES_PER_OPTION_MAX, `An option has at most ${LINES_PER_OPTION_MAX} lines.`),
});
export type QuoteOptionInput = z.infer<typeof quoteOptionInputSchema>;

const quoteBody = {
  equipmentId: z.preprocess(blankToNull, id('Choose the system the quote is for.').nullable()).default(null),
  note: z.preprocess(blankToUndefined, text('Note to the homeowner', 2000).default('')),
  photoIds: z.array(id('Choose photos from this visit.'), { error: 'Photos are a list.' }).max(12, 'Attach at most 12 photos.').default([]),
  options: z
    .array(quoteOptionInputSchema, { error: 'A quote is a list of options.' })
    .min(1, 'Add at least one option.')
    .max(OPTIONS_PER_QUOTE_MAX, `A quote has at most ${OPTIONS_PER_QUOTE_MAX} options.`),
  /** Days the prices hold once sent. */
  validDays: wholeNumber('Days the quote holds', 1, 90).default(30),
};

export const quoteCreateSchema = z.object({ visitId: id('Choose the visit this quote is for.'), ...quoteBody });
export type QuoteCreate = z.infer<typeof quoteCreateSchema>;

/** Saves the whole draft; `revision` is the one the editor started from, so two devices cannot overwrite each other. */
export const quoteUpdateSchema = z.object({ revision: wholeNumber('Revision', 1, 999), ...quoteBody });
export type QuoteUpdate = z.infer<typeof quoteUpdateSchema>;

export const quoteSendSchema = z.object({
  revision: wholeNumber('Revision', 1, 999),
  /** Another address than the household's, e.g. the spouse who decides. */
  email: z.preprocess(blankToNull, emailSchema.nullable()).default(null),
});
export type QuoteSend = z.infer<typeof quoteSendSchema>;

/** The homeowner approves one option with a typed name; the server records the time and IP. */
export const quoteApproveSchema = z.object({
  revision: wholeNumber('Revision', 1, 999),
  optionId: id('Choose the option you approve.'),
  typedName: z.string({ error: 'Type your name to approve.' }).trim().min(2, 'Type your full name to approve.').max(120, 'Keep your name under 120 characters.'),
  agreed: z.literal(true, { error: 'Tick the box to approve the work and its price.' }),
});
export type QuoteApprove = z.infer<typeof quoteApproveSchema>;

export const quoteDeclineSchema = z.object({
  revision: wholeNumber('Revision', 1, 999),
  reason: z.string({ error: 'Tell us why you are declining.' }).trim().min(3, 'Tell us why you are declining, so we can help.').max(1000, 'Keep the reason under 1000 characters.'),
});
export type QuoteDecline = z.infer<typeof quoteDeclineSchema>;

export const QUOTE_SORTS = ['createdAt', 'totalCents', 'status'] as const;
export const quoteListQuerySchema = z.object({
  status: z.preprocess(blankToUndefined, z.enum([...QUOTE_STATUSES, 'open'], { error: 'Status is draft, sent, approved, declined, expired or open.' }).optional()),
  customerId: z.preprocess(blankToUndefined, id('Choose a household.').optional()),
  visitId: z.preprocess(blankToUndefined, id('Choose a visit.').optional()),
  ...sortFields(QUOTE_SORTS, 'createdAt', 'desc'),
  ...pageFields,
});
export type QuoteListQuery = z.infer<typeof quoteListQuerySchema>;

// ---- Quote responses ----

export type CoverageRuleName = 'warranty_part' | 'warranty_labor' | 'tune_up_included' | 'diagnostic_waived' | 'repair_discount' | 'regular';

export interface QuoteLineView {
  id: string;
  itemId: string | null;
  itemVersionId: string | null;
  taskId: string | null;
  /** Lines of one flat-rate task share a group. */
  group: string | null;
  sku: string | null;
  description: string;
  kind: ItemKind;
  category: ItemCategory;
  quantity: number;
  unitCents: number;
  taxable: boolean;
  grossCents: number;
  savingsCents: number;
  chargedCents: number;
  rules: CoverageRuleName[];
  /** The coverage written out, e.g. "Repair discount 15 %: −$27.00." */
  reason: string;
  stockLocationId: string | null;
}

export interface QuoteOptionView {
  id: string;
  title: string;
  description: string;
  lines: QuoteLineView[];
  subtotalCents: number;
  savingsCents: number;
  taxableCents: number;
  taxCents: number;
  totalCents: number;
}

export interface QuoteRevisionSummary {
  revision: number;
  status: QuoteStatus;
  createdAt: string;
  createdBy: string | null;
  totalsCents: number[];
}

export interface QuoteView {
  id: string;
  number: number | null;
  visitId: string;
  customerId: string;
  customerName: string;
  propertyId: string;
  equipmentId: string | null;
  status: QuoteStatus;
  statusLabel: string;
  revision: number;
  note: string;
  photos: { id: string; url: string; thumbUrl: string | null; caption: string }[];
  options: QuoteOptionView[];
  /** Plain sentences about the plan for the banner, e.g. that it is past due. */
  coverageNotes: string[];
  taxRateBps: number;
  validUntil: string | null;
  sentAt: string | null;
  sentTo: string | null;
  approval: { optionId: string; typedName: string; at: string; ip: string; onDevice: 'portal' | 'technician' } | null;
  decline: { reason: string; at: string } | null;
  invoiceId: string | null;
  followUpVisitRequestId: string | null;
  revisions: QuoteRevisionSummary[];
  createdAt: string;
}

export interface QuoteSummary {
  id: string;
  number: number | null;
  customerName: string;
  status: QuoteStatus;
  revision: number;
  /** The largest option's total, for the open-quotes list. */
  totalCents: number;
  ageDays: number;
  createdAt: string;
}

export interface QuoteStats {
  open: { count: number; valueCents: number };
  /** Approved ÷ (approved + declined + expired), in basis points, over the period. */
  approvalRateBps: number | null;
  periodDays: number;
}

// ---- Truck stock ----

export const STOCK_LOCATION_KINDS = ['truck', 'shop'] as const;
export type StockLocationKind = (typeof STOCK_LOCATION_KINDS)[number];

export const stockLocationInputSchema = z
  .object({
    kind: z.enum(STOCK_LOCATION_KINDS, { error: 'Location is a truck or the shop.' }),
    name: z.string({ error: 'Name the location.' }).trim().min(1, 'Name the location, like "Truck 3".').max(60, 'Keep the location name under 60 characters.'),
    technicianId: z.preprocess(blankToNull, id('Choose the technician who drives this truck.').nullable()).default(null),
  })
  .superRefine((l, ctx) => {
    if (l.kind === 'truck' && !l.technicianId) ctx.addIssue({ code: 'custom', path: ['technicianId'], message: 'Choose the technician who drives this truck.' });
    if (l.kind === 'shop' && l.technicianId) ctx.addIssue({ code: 'custom', path: ['technicianId'], message: 'The shop has no technician.' });
  });
export type StockLocationInput = z.infer<typeof stockLocationInputSchema>;

/** Sets what a location should carry of one item. */
export const stockRowInputSchema = z.object({
  itemId: id('Choose a part from the price book.'),
  minimum: stockCount('Minimum', 0),
  /** Counted on hand; left out keeps the recorded count. */
  quantity: stockCount('Quantity on hand', 0).optional(),
});
export type StockRowInput = z.infer<typeof stockRowInputSchema>;

const movementLines = z
  .array(z.object({ itemId: id('Choose a part from the price book.'), quantity: stockCount('Quantity', 1) }), { error: 'List the parts and how many.' })
  .min(1, 'Add at least one part.')
  .max(100, 'At most 100 parts at once.')
  .refine((ls) => new Set(ls.map((l) => l.itemId)).size === ls.length, 'List each part once.');

/** Parts received from the supplier into a location. */
export const restockSchema = z.object({
  locationId: id('Choose the truck or the shop.'),
  lines: movementLines,
  note: z.preprocess(blankToUndefined, text('Note', 500).default('')),
});
export type Restock = z.infer<typeof restockSchema>;

export const transferSchema = z
  .object({
    fromLocationId: id('Choose where the parts come from.'),
    toLocationId: id('Choose where the parts go.'),
    lines: movementLines,
    note: z.preprocess(blankToUndefined, text('Note', 500).default('')),
  })
  .refine((t) => t.fromLocationId !== t.toLocationId, { error: 'Choose two different places.', path: ['toLocationId'] });
export type Transfer = z.infer<typeof transferSchema>;

export const stockListQuerySchema = z.object({
  locationId: z.preprocess(blankToUndefined, id('Choose a truck or the shop.').optional()),
  belowMinimum: z.preprocess((v) => (v === 'true' ? true : v === 'false' ? false : v), z.boolean({ error: 'Below minimum is true or false.' }).default(false)),
  q: z.preprocess(blankToUndefined, z.string({ error: 'Search is text.' }).trim().max(100, 'Keep the search under 100 characters.').optional()),
});
export type StockListQuery = z.infer<typeof stockListQuerySchema>;

export interface StockLocation {
  id: string;
  kind: StockLocationKind;
  name: string;
  technicianId: string | null;
  technicianName: string | null;
}

export interface StockRow {
  locationId: string;
  locationName: string;
  itemId: string;
  sku: string;
  name: string;
  category: ItemCategory;
  quantity: number;
  minimum: number;
  belowMinimum: boolean;
  /** How many to bring it back to its minimum. */
  shortBy: number;
}

// ---- Finding a replacement: the failed part's nameplate ----

export const failedMotorSchema = z
  .object({
    category: z.literal('motor'),
    application: z
      .preprocess((v) => blankToNull(lowerWord(v)), z.enum(MOTOR_APPLICATIONS, { error: 'Use is indoor blower, condenser fan, draft inducer or other.' }).nullable())
      .default(null),
    horsepower: horsepowerValue('Horsepower'),
    /** The failed motor's nameplate volts. */
    volts: voltRanges('Volts'),
    /** The supply measured or known at the unit; matched on its own when given. */
    supplyVolts: z
      .preprocess(
        (v) => numberish(blankToNull(v)),
        z
          .number({ error: 'Supply volts is a number.' })
          .int('Supply volts is a whole number.')
          .min(12, 'Supply volts is at least 12.')
          .max(600, 'Supply volts is at most 600.')
          .nullable(),
      )
      .default(null),
    phase: phaseSchema,
    rpm: wholeNumber('RPM', 300, 3600),
    speeds: wholeNumber('Speeds', 1, 5),
    speedsUsed: wholeNumber('Speeds used', 1, 5),
    /** Which taps were wired, when the technician noted them. */
    tapsInUse: z
      .array(z.enum(SPEED_TAPS, { error: `A speed tap is one of ${SPEED_TAPS.join(', ')}.` }))
      .max(5, 'List at most 5 speed taps.')
      .default([]),
    amps: amount('Rated amps', 0.1, 60, ' A'),
    /** The direction it turned in the unit; "unknown" when the nameplate said reversible and nobody checked. */
    rotation: z.preprocess(lowerWord, z.enum(['cw', 'ccw', 'unknown'], { error: 'Rotation is CW, CCW or unknown.' })),
    rotationViewedFrom: z
      .preprocess((v) => blankToNull(lowerWord(v)), z.enum(ROTATION_VIEWS, { error: 'Say whether rotation is seen from the shaft end or the lead end.' }).nullable())
      .default(null),
    shaft: shaftSchema.nullable().default(null),
    frame: z.preprocess(blankToNull, text('Frame', 10).nullable()).default(null),
    /** The old run capacitor's µF, to say whether it can stay. */
    oldCapacitorMicrofarads: z
      .preprocess(
        (v) => numberish(blankToNull(v)),
        z.number({ error: 'Old capacitor µF is a number.' }).positive('Old capacitor µF is more than 0.').max(100, 'Old capacitor µF is at most 100.').nullable(),
      )
      .default(null),
  })
  .superRefine((m, ctx) => {
    if (m.rotation !== 'unknown' && !m.rotationViewedFrom)
      ctx.addIssue({ code: 'custom', path: ['rotationViewedFrom'], message: 'Say whether rotation is seen from the shaft end or the lead end.' });
    if (m.speedsUsed > m.speeds) ctx.addIssue({ code: 'custom', path: ['speedsUsed'], message: 'Speeds used cannot be more than the motor has.' });
    if (m.tapsInUse.length && m.tapsInUse.length !== m.speedsUsed) ctx.addIssue({ code: 'custom', path: ['tapsInUse'], message: 'List one tap for each speed used.' });
    if (new Set(m.tapsInUse).size !== m.tapsInUse.length) ctx.addIssue({ code: 'custom', path: ['tapsInUse'], message: 'List each tap once.' });
  });
export type FailedMotor = z.infer<typeof failedMotorSchema>;

export const failedCapacitorSchema = z.object({
  category: z.literal('capacitor'),
  microfarads: sectionsSchema,
  volts: wholeNumber('Capacitor volts', 110, 600),
  shape: z.preprocess((v) => blankToNull(lowerWord(v)), z.enum(CAPACITOR_SHAPES, { error: 'Shape is round or oval.' }).nullable()).default(null),
  tolerancePct: wholeNumber('Tolerance', 1, 20).default(DEFAULT_CAPACITOR_TOLERANCE_PCT),
});
export type FailedCapacitor = z.infer<typeof failedCapacitorSchema>;

export const replacementSearchSchema = z.object({
  failed: z.discriminatedUnion('category', [failedMotorSchema, failedCapacitorSchema], { error: 'Search for a motor or a capacitor.' }),
  visitId: z.preprocess(blankToNull, id('Choose the visit.').nullable()).default(null),
});
export type ReplacementSearch = z.infer<typeof replacementSearchSchema>;

// ---- Invoicing work without a quote ----

export const directInvoiceSchema = z.object({
  customerId: id('Choose a household.'),
  /** The visit the work was done on; its date decides the coverage. */
  visitId: z.preprocess(blankToNull, id('Choose the visit.').nullable()).default(null),
  equipmentId: z.preprocess(blankToNull, id('Choose the system the work was on.').nullable()).default(null),
  lines: z
    .array(quoteLineInputSchema, { error: 'An invoice is a list of lines.' })
    .min(1, 'Add at least one line.')
    .max(LINES_PER_OPTION_MAX, `At most ${LINES_PER_OPTION_MAX} lines.`),
  notes: z.preprocess(blankToUndefined, text('Notes', 2000).default('')),
  /** E-mail the homeowner a pay-online link as soon as it is issued. */
  sendPayLink: z.boolean({ error: 'Say whether to e-mail the pay-online link.' }).default(true),
});
export type DirectInvoice = z.infer<typeof directInvoiceSchema>;

// ---- CSV import and export: one row per item, with the spec's values in their own columns ----

/** Export writes these headings, in this order, so an export imports back unchanged. */
export const PRICE_BOOK_EXPORT_COLUMNS = PRICE_BOOK_FIELD_KEYS;

/** For each of our fields, the CSV column it reads from (or null to leave it out). */
export const priceBookMappingSchema = z.record(z.string(), z.string().nullable()).superRefine((m, ctx) => {
  for (const key of Object.keys(m)) {
    if (!(PRICE_BOOK_FIELD_KEYS as string[]).includes(key)) ctx.addIssue({ code: 'custom', path: [key], message: `${key} is not a price-book column.` });
  }
  for (const f of PRICE_BOOK_IMPORT_FIELDS) {
    if (f.required && !m[f.key]) ctx.addIssue({ code: 'custom', path: [f.key], message: `Choose the column that holds the ${f.label === 'SKU' ? 'SKU' : f.label.toLowerCase()}.` });
  }
});

/** The household import's problem, with our own field names. */
export type PriceBookImportProblem = Omit<ImportProblem, 'field'> & { field: PriceBookFieldKey | '_' };

export interface PriceBookImportCheck {
  valid: boolean;
  rowCount: number;
  problems: PriceBookImportProblem[];
  /** By SKU: new items, items whose values change (a new version), and items left as they are. */
  counts: { created: number; updated: number; unchanged: number } | null;
}
export type { ImportMapping, ImportPreview };
