import * as z from 'zod';
import type { Coverage } from '../coverage';
import type { CompressorType } from '../equipment';
import type { Caution, ChecklistItem, ReadingCheck, VisitReadings } from '../hvac';
import { visitReadingsSchema } from '../hvac/readings';
import type { VisitKind, VisitReason, VisitStatus } from '../visits';
import type { StoredFile } from './customers';
import { CHECKLIST_RESULTS, type ChecklistResult } from '../checklist';
export { CHECKLIST_RESULTS, type ChecklistResult, CHECKLIST_RESULT_LABELS, CHECK_LABELS } from '../checklist';

export const READING_STATUSES = ['ok', 'watch', 'alert'] as const;
export type ReadingStatus = (typeof READING_STATUSES)[number];

const longText = (label: string, max = 4000) =>
  z
    .string({ error: `${label} must be text` })
    .trim()
    .max(max, `${label} must be at most ${max} characters`);

// ---- Requests ----

export const saveReadingsSchema = z.strictObject({
  equipmentId: z.uuid({ error: 'Choose the system these readings are for' }),
  readings: visitReadingsSchema,
});
export type SaveReadings = z.infer<typeof saveReadingsSchema>;

export const saveChecklistSchema = z.strictObject({
  season: z.enum(['cooling', 'heating'], { error: 'Season must be cooling or heating' }),
  items: z
    .array(
      z.strictObject({
        equipmentId: z.uuid({ error: 'Equipment id is not valid' }),
        itemId: z.string().min(1, 'Item id is needed').max(80),
        result: z.enum(CHECKLIST_RESULTS, { error: `Result must be one of ${CHECKLIST_RESULTS.join(', ')}` }),
        note: longText('Note', 500).default(''),
      }),
    )
    .max(400, 'Too many checklist items'),
});
export type SaveChecklist = z.infer<typeof saveChecklistSchema>;

const answer = z.boolean({ error: 'Answer yes, no, or leave it unchecked' }).nullable().default(null);
export const troubleshootingSchema = z.strictObject({
  thermostatCalling: answer,
  controlVoltageAtRC: answer,
  callVoltageAtYCOutdoor: answer,
  callVoltageAtWC: answer,
  condensateSwitchTripped: answer,
  breakerTripped: answer,
  disconnectOff: answer,
  fuseBlown: answer,
  causeFound: longText('Cause found', 2000).default(''),
  fixMade: longText('Fix made', 2000).default(''),
});
export type Troubleshooting = z.infer<typeof troubleshootingSchema>;

export const visitNotesSchema = z.strictObject({
  findings: longText('Findings').default(''),
  recommendations: longText('Recommendations').default(''),
});
export type VisitNotes = z.infer<typeof visitNotesSchema>;

// A signature drawn on the phone, as a PNG data URL; a few hundred kilobytes at most.
const SIGNATURE_PNG = /^data:image\/png;base64,[A-Za-z0-9+/]+={0,2}$/;

export const completeVisitSchema = z.strictObject({
  findings: longText('Findings').min(1, 'Findings are needed to complete the visit'),
  recommendations: longText('Recommendations').default(''),
  /** Why open checklist items were left, when any are. */
  skippedReason: longText('Reason for skipped items', 1000).default(''),
  repairDone: z.boolean({ error: 'Say whether a repair was done (true or false)' }).default(false),
  signature: z
    .strictObject({
      image: z.string({ error: 'The signature is missing' }).max(400_000, 'The signature image is too large').regex(SIGNATURE_PNG, 'The signature must be a PNG image'),
      signedBy: z.string({ error: 'Name who signed' }).trim().min(1, 'Name who signed').max(120, 'Name has at most 120 characters'),
    })
    .optional(),
});
export type CompleteVisit = z.infer<typeof completeVisitSchema>;

// ---- Responses ----

export interface TodayVisit {
  id: string;
  kind: VisitKind;
  reason: VisitReason;
  reasonLabel: string;
  status: VisitStatus;
  statusLabel: string;
  windowStart: string;
  windowEnd: string;
  /** "9–11 am" in the company's time zone. */
  windowLabel: string;
  /** "Arrival 9–11 am" and "1 h 30 min of work booked" (visitTimeLabels in shared/visits.ts). */
  arrivalLabel: string;
  workLabel: string;
  customerName: string;
  address: string;
  planStatus: { covered: boolean; label: string };
  technicianName: string | null;
}

export interface FieldEquipment {
  id: string;
  kind: string;
  kindLabel: string;
  make: string;
  model: string;
  serial: string;
  installedOn: string | null;
  ageYears: number | null;
  refrigerant: string | null;
  meteringDevice: string | null;
  capacityBtuh: number | null;
  nominalTons: number | null;
  volts: number | null;
  ratedAmps: number | null;
  warrantyEndsOn: string | null;
  underWarranty: boolean | null;
  filterSize: string;
  location: string;
  /** How the compressor's capacity is controlled; null when not recorded. */
  compressorType?: CompressorType | null;
  /** A variable-speed unit's maximum compressor frequency, Hz. */
  maxCompressorHz?: number | null;
  /** Nameplate or blower-table maximum external static pressure, in. w.c. */
  maxExternalStaticInWc?: number | null;
}

export interface PastVisit {
  id: string;
  onDate: string;
  reasonLabel: string;
  findings: string;
  recommendations: string;
}

export interface ChecklistSection {
  equipmentId: string;
  equipmentLabel: string;
  items: (ChecklistItem & { result: ChecklistResult | null; note: string })[];
}

export interface SavedReadings {
  equipmentId: string;
  readings: VisitReadings;
  checks: ReadingCheck[];
  worstStatus: ReadingStatus | null;
  recordedAt: string;
}

export interface FieldVisit {
  visit: TodayVisit & { notes: string; symptoms: string[]; findings: string; recommendations: string; completedAt: string | null; onDate: string };
  customer: { id: string; name: string; phone: string | null };
  property: { id: string; address: string; accessNotes: string; elevationFt: number | null };
  equipment: FieldEquipment[];
  pastVisits: PastVisit[];
  coverage: Coverage;
  season: 'cooling' | 'heating';
  checklist: ChecklistSection[];
  troubleshooting: Troubleshooting | null;
  /** Set for no-cooling and no-heat calls: show the structured troubleshooting record. */
  troubleshootingKind: 'no_cooling' | 'no_heat' | null;
  readings: SavedReadings[];
  /** Photos taken on this visit, through the uploads API with the visit id. */
  photos: StoredFile[];
  cautions: Caution[];
}

export interface CompletedVisit {
  id: string;
  status: VisitStatus;
  completedAt: string;
  summaryEmailed: boolean;
}

// ---- Homeowner side ----

export interface ReadingPoint {
  visitId: string;
  recordedAt: string;
  value: number;
  status: ReadingStatus;
  expected: { min?: number; max?: number; target?: number };
}

export interface ReadingSeries {
  check: string;
  label: string;
  unit: string;
  points: ReadingPoint[];
}

export interface SystemReadings {
  equipmentId: string;
  label: string;
  series: ReadingSeries[];
}

export interface PropertyReadings {
  propertyId: string;
  systems: SystemReadings[];
}

export interface VisitSummary {
  id: string;
  propertyId: string;
  onDate: string;
  reasonLabel: string;
  statusLabel: string;
  technicianName: string | null;
  findings: string;
  recommendations: string;
  /** Plain-words lines, one per reading check. */
  readings: { system: string; lines: { text: string; status: ReadingStatus }[] }[];
  photos: StoredFile[];
  cautions: Caution[];
}

/** The worst status among checks: alert over watch over ok; null when nothing was checked. */
export function worstStatus(checks: readonly { status: ReadingStatus }[]): ReadingStatus | null {
  if (checks.some((c) => c.status === 'alert')) return 'alert';
  if (checks.some((c) => c.status === 'watch')) return 'watch';
  return checks.length ? 'ok' : null;
}
