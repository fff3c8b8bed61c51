import * as z from 'zod';
import { blankToUndefined } from './lists';
import { COMPRESSOR_TYPES, EQUIPMENT_KINDS, REFRIGERANTS } from '../equipment';
import { isIsoDate } from './dates';

// The API contract for equipment at a property. Capacity is stored in Btu/h; tons are accepted.

/** One ton of refrigeration is 12,000 Btu/h by definition. */
export const BTUH_PER_TON = 12_000;

export const REFRIGERANT_CHOICES = [...REFRIGERANTS, 'none'] as const;
export type RefrigerantChoice = (typeof REFRIGERANT_CHOICES)[number];

const blankToNull = (v: unknown) => (v === undefined || (typeof v === 'string' && v.trim() === '') ? null : v);
const numberish = (v: unknown) => (typeof v === 'string' && v.trim() !== '' ? Number(v.trim().replace(/,/g, '')) : v);

const text = (label: string, max: number) =>
  z.preprocess(
    blankToUndefined,
    z
      .string({ error: `${label} must be text.` })
      .trim()
      .max(max, `Keep ${label.toLowerCase()} under ${max} characters.`)
      .default(''),
  );

const isoDate = (label: string) =>
  z.preprocess(
    blankToNull,
    z
      .string({ error: `${label} is a date like 2019-06-30.` })
      .trim()
      .regex(/^\d{4}-\d{2}-\d{2}$/, `${label} is a date like 2019-06-30.`)
      .refine(isIsoDate, `${label} is not a real calendar date.`)
      .refine((d) => d >= '1950-01-01' && d <= '2100-12-31', `${label} must be between 1950 and 2100.`)
      .nullable(),
  );

const optionalInt = (label: string, min: number, max: number) =>
  z.preprocess(
    (v) => numberish(blankToNull(v)),
    z
      .number({ error: `${label} is a number.` })
      .int(`${label} is a whole number.`)
      .min(min, `${label} is at least ${min}.`)
      .max(max, `${label} is at most ${max}.`)
      .nullable(),
  );

/** "16 x 25 x 1", "16X25X1" and "16x25x1 in" become "16x25x1"; fractional depths like 4.5 are allowed. */
export const filterSizeSchema = z.preprocess(
  (v) =>
    typeof v === 'string'
      ? v
          .trim()
          .replace(/\s*(in(ch(es)?)?\.?)$/i, '')
          .replace(/\s*[xX×]\s*/g, 'x')
          .replace(/"/g, '')
      : v,
  z.union([z.literal(''), z.string().regex(/^\d{1,2}(\.\d{1,2})?x\d{1,2}(\.\d{1,2})?x\d{1,2}(\.\d{1,2})?$/, 'Filter size is width x height x depth in inches, like 16x25x1.')]),
);

/** "r410a", "R 410A" and "R-410A" name the same refrigerant; blank or "none" means none. */
function refrigerantWord(v: string): string {
  const t = v.trim().toUpperCase().replace(/\s+/g, '');
  if (t === '' || t === 'NONE') return 'none';
  return t.replace(/^R-?(\d)/, 'R-$1');
}

const capacityUnitSchema = z.enum(['tons', 'btuh'], { error: 'Capacity unit is tons or btuh.' });

const equipmentFields = {
  kind: z.enum(EQUIPMENT_KINDS, { error: 'Choose the kind of equipment.' }),
  make: text('Make', 60),
  model: text('Model', 60),
  serial: text('Serial', 60),
  installedOn: isoDate('Install date'),
  refrigerant: z.preprocess(
    (v) => (typeof v === 'string' ? refrigerantWord(v) : (v ?? 'none')),
    z.enum(REFRIGERANT_CHOICES, { error: `Refrigerant is one of ${REFRIGERANT_CHOICES.join(', ')}.` }),
  ),
  capacity: z.preprocess((v) => numberish(blankToNull(v)), z.number({ error: 'Capacity is a number.' }).positive('Capacity is more than 0.').nullable()),
  capacityUnit: capacityUnitSchema.default('btuh'),
  volts: optionalInt('Volts', 12, 600),
  phase: z.preprocess((v) => numberish(blankToNull(v)), z.union([z.literal(1), z.literal(3), z.null()], { error: 'Phase is 1 or 3.' })),
  ratedAmps: z.preprocess(
    (v) => numberish(blankToNull(v)),
    z.number({ error: 'Rated amps is a number.' }).positive('Rated amps is more than 0.').max(400, 'Rated amps is at most 400.').nullable(),
  ),
  filterSize: filterSizeSchema.default(''),
  filterType: text('Filter type', 60),
  merv: optionalInt('MERV', 1, 16),
  warrantyEndsOn: isoDate('Warranty end'),
  location: text('Location', 120),
  notes: text('Notes', 2000),
  /** Fixed-speed, two-stage or variable-speed (inverter) compressor; left out means not recorded. */
  compressorType: z.preprocess(blankToNull, z.enum(COMPRESSOR_TYPES, { error: `Compressor type is one of ${COMPRESSOR_TYPES.join(', ')}.` }).nullable()).optional(),
  /** A variable-speed unit's maximum compressor frequency, from the nameplate or the maker's data; it differs by model and size. */
  maxCompressorHz: z
    .preprocess(
      (v) => numberish(blankToNull(v)),
      z
        .number({ error: 'Maximum compressor frequency is a number.' })
        .positive('Maximum compressor frequency is more than 0 Hz.')
        .max(300, 'Maximum compressor frequency is at most 300 Hz.')
        .nullable(),
    )
    .optional(),
  /** Maximum total external static pressure from the nameplate or blower table, in. w.c. */
  maxExternalStaticInWc: z
    .preprocess(
      (v) => numberish(blankToNull(v)),
      z
        .number({ error: 'Maximum external static pressure is a number.' })
        .positive('Maximum external static pressure is more than 0.')
        .max(2, 'Maximum external static pressure is at most 2 in. w.c.')
        .nullable(),
    )
    .optional(),
};

function variableSpeedFields(v: { compressorType?: string | null; maxCompressorHz?: number | null }, ctx: z.RefinementCtx): void {
  if (v.maxCompressorHz != null && v.compressorType != null && v.compressorType !== 'variable_speed') {
    ctx.addIssue({ code: 'custom', path: ['maxCompressorHz'], message: 'Maximum compressor frequency is for a variable-speed compressor.' });
  }
}

type CapacityIn = { capacity?: number | null; capacityUnit?: 'tons' | 'btuh' };

function capacityToBtuh<T extends CapacityIn>(v: T, ctx: z.RefinementCtx): number | null | undefined {
  if (v.capacity === undefined) return undefined;
  if (v.capacity === null) return null;
  const btuh = Math.round(v.capacityUnit === 'tons' ? v.capacity * BTUH_PER_TON : v.capacity);
  if (btuh < 1000 || btuh > 600_000) {
    ctx.addIssue({ code: 'custom', path: ['capacity'], message: 'Capacity is between 1,000 and 600,000 Btu/h (about 0.1 to 50 tons).' });
    return z.NEVER;
  }
  return btuh;
}

const withCapacity = <T extends CapacityIn & { refrigerant?: RefrigerantChoice }>(v: T, ctx: z.RefinementCtx) => {
  const capacityBtuh = capacityToBtuh(v, ctx);
  const { capacity: _c, capacityUnit: _u, refrigerant, ...rest } = v;
  return {
    ...rest,
    ...(capacityBtuh !== undefined ? { capacityBtuh } : {}),
    ...(refrigerant !== undefined ? { refrigerant: refrigerant === 'none' ? null : refrigerant } : {}),
  };
};

export const equipmentInputSchema = z
  .object({
    ...equipmentFields,
    installedOn: equipmentFields.installedOn.default(null),
    refrigerant: equipmentFields.refrigerant.default('none'),
    capacity: equipmentFields.capacity.default(null),
    volts: equipmentFields.volts.default(null),
    phase: equipmentFields.phase.default(null),
    ratedAmps: equipmentFields.ratedAmps.default(null),
    merv: equipmentFields.merv.default(null),
    warrantyEndsOn: equipmentFields.warrantyEndsOn.default(null),
  })
  .superRefine((v, ctx) => {
    if (v.installedOn && v.warrantyEndsOn && v.warrantyEndsOn < v.installedOn)
      ctx.addIssue({ code: 'custom', path: ['warrantyEndsOn'], message: 'Warranty end is after the install date.' });
    variableSpeedFields(v, ctx);
  })
  .transform(withCapacity);
export type EquipmentInput = z.infer<typeof equipmentInputSchema>;

// No defaults here: a change to one field must not blank the filter size, and an empty change is refused.
export const equipmentUpdateSchema = z
  .object({ ...equipmentFields, filterSize: filterSizeSchema, capacityUnit: capacityUnitSchema })
  .partial()
  .refine((v) => Object.values(v).some((x) => x !== undefined), { error: 'Send at least one field to change.' })
  .superRefine(variableSpeedFields)
  .transform(withCapacity);
export type EquipmentUpdate = z.infer<typeof equipmentUpdateSchema>;

export const equipmentSchema = z.object({
  id: z.uuid(),
  propertyId: z.uuid(),
  kind: z.enum(EQUIPMENT_KINDS),
  kindLabel: z.string(),
  make: z.string(),
  model: z.string(),
  serial: z.string(),
  installedOn: z.string().nullable(),
  refrigerant: z.string().nullable(),
  capacityBtuh: z.number().nullable(),
  capacityTons: z.number().nullable(),
  volts: z.number().nullable(),
  phase: z.number().nullable(),
  ratedAmps: z.number().nullable(),
  filterSize: z.string(),
  filterType: z.string(),
  merv: z.number().nullable(),
  warrantyEndsOn: z.string().nullable(),
  warranty: z.enum(['unknown', 'active', 'ending_soon', 'expired']),
  warrantyLabel: z.string(),
  location: z.string(),
  notes: z.string(),
  compressorType: z.enum(COMPRESSOR_TYPES).nullable().optional(),
  maxCompressorHz: z.number().nullable().optional(),
  maxExternalStaticInWc: z.number().nullable().optional(),
  ageText: z.string().nullable(),
  ageYears: z.number().nullable(),
  life: z.object({ status: z.enum(['unknown', 'ok', 'nearing', 'past']), label: z.string(), typicalYears: z.number(), source: z.string() }),
  archived: z.boolean(),
});
export type Equipment = z.infer<typeof equipmentSchema>;
