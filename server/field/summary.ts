import { and, asc, eq, isNull } from 'drizzle-orm';
import { DateTime } from 'luxon';
import { cautions, homeownerWording, technicianCautionsFor, type Caution } from '../../shared/hvac';
import type { VisitSummary } from '../../shared/schemas/field';
import { VISIT_REASON_LABELS, VISIT_STATUS_LABELS } from '../../shared/visits';
import type { Db, Tx } from '../db/client';
import { equipment, files, technicians, users, visitReadings } from '../db/schema';
import { toFile } from '../customers/customer-views';
import { renderEmail } from '../integrations/mail-layout';
import { COMPANY_COUNTRY, localDate } from '../company/company';
import { equipmentLabel, propertyEquipment, type CompanyInfo, type EquipmentRow, type VisitRow } from './visit-data';
import { formatPhone } from '../../shared/phone';

const FUEL_BURNING = new Set(['gas_furnace']);

/** Cautions a homeowner should see for this home's equipment. */
export function homeownerCautions(kinds: readonly string[]): Caution[] {
  const fuel = kinds.some((k) => FUEL_BURNING.has(k));
  return cautions.filter((c) => c.audience.includes('homeowner') && (c.id !== 'co_alarms' || fuel));
}

/**
 * Cautions for the technician on this visit, by what the equipment involves: A2L cautions only
 * where an A2L refrigerant is on record, CO cautions only with fuel-burning equipment.
 */
export function technicianCautions(items: readonly Pick<EquipmentRow, 'kind' | 'refrigerant'>[]): Caution[] {
  const refrigerants = items.map((e) => e.refrigerant).filter((r): r is NonNullable<typeof r> => r !== null);
  return technicianCautionsFor({ fuelBurning: items.some((e) => FUEL_BURNING.has(e.kind)), hasRefrigerant: refrigerants.length > 0, refrigerants });
}

/** Photos filed against the visit, oldest first. */
export async function visitPhotos(db: Db | Tx, visitId: string) {
  const rows = await db
    .select()
    .from(files)
    .where(and(eq(files.visitId, visitId), isNull(files.archivedAt)))
    .orderBy(asc(files.createdAt));
  return rows.filter((f) => f.contentType.startsWith('image/')).map(toFile);
}

/** The visit in plain words for the homeowner: what was found, what is recommended, each reading's verdict. */
export async function visitSummary(db: Db | Tx, visit: VisitRow, info: CompanyInfo): Promise<VisitSummary> {
  const rows = await db
    .select({ checks: visitReadings.checks, kind: equipment.kind, make: equipment.make, model: equipment.model })
    .from(visitReadings)
    .innerJoin(equipment, eq(visitReadings.equipmentId, equipment.id))
    .where(eq(visitReadings.visitId, visit.id))
    .orderBy(asc(visitReadings.recordedAt));
  let technicianName: string | null = null;
  if (visit.technicianId) {
    const [t] = await db.select({ name: users.name }).from(technicians).innerJoin(users, eq(technicians.userId, users.id)).where(eq(technicians.id, visit.technicianId)).limit(1);
    technicianName = t?.name ?? null;
  }
  const kinds = (await propertyEquipment(db, visit.propertyId)).map((e) => e.kind);
  return {
    id: visit.id,
    propertyId: visit.propertyId,
    onDate: localDate(visit.startsAt, info.timeZone),
    reasonLabel: VISIT_REASON_LABELS[visit.reason],
    statusLabel: VISIT_STATUS_LABELS[visit.status],
    technicianName,
    findings: visit.findings,
    recommendations: visit.recommendations,
    readings: rows.map((r) => ({
      system: equipmentLabel(r),
      lines: r.checks.map((c) => ({ text: homeownerWording(c), status: c.status })),
    })),
    photos: await visitPhotos(db, visit.id),
    cautions: homeownerCautions(kinds),
  };
}

/** The e-mail sent when the visit is completed; the portal page holds the same summary. */
export function summaryEmail(summary: VisitSummary, info: CompanyInfo, portalUrl: string): { subject: string; html: string; text: string } {
  const day = DateTime.fromISO(summary.onDate).toFormat('MMMM d');
  const paragraphs: string[] = [
    `${summary.technicianName ?? 'Your technician'} finished your ${summary.reasonLabel.toLowerCase()} visit on ${day}. Here is what we found, in plain words.`,
    `What we found: ${summary.findings || 'No faults found.'}`,
  ];
  if (summary.recommendations) paragraphs.push(`What we recommend: ${summary.recommendations}`);
  for (const group of summary.readings) {
    if (group.lines.length) paragraphs.push(`${group.system}\n${group.lines.map((l) => `• ${l.text}`).join('\n')}`);
  }
  paragraphs.push(`Questions? Call ${info.name} at ${formatPhone(info.phone, COMPANY_COUNTRY)}.`);
  const { html, text } = renderEmail({
    title: `Your ${summary.reasonLabel.toLowerCase()} summary`,
    paragraphs,
    action: { label: 'See the summary and your readings', url: portalUrl },
    footer: summary.cautions.map((c) => `${c.title}: ${c.text}`).join('\n'),
  });
  return { subject: `Your ${summary.reasonLabel.toLowerCase()} visit summary (${day})`, html, text };
}
