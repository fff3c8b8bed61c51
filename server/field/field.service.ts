import { and, asc, desc, eq, gte, lt, ne, notInArray } from 'drizzle-orm';
import { DateTime } from 'luxon';
import type { Logger } from 'pino';
import { tuneUpSeasonOf } from '../../shared/coverage';
import { evaluateReadings, furnaceHasCasedCoil, ReadingInputError, tuneUpChecklist, type EquipmentKind, type Season, type VisitReadings } from '../../shared/hvac';
import type { SeasonSettings } from '../../shared/seasons';
import {
  worstStatus,
  type ChecklistSection,
  type CompletedVisit,
  type CompleteVisit,
  type FieldVisit,
  type SaveChecklist,
  type SavedReadings,
  type SaveReadings,
  type TodayVisit,
  type Troubleshooting,
  type VisitNotes,
} from '../../shared/schemas/field';
import type { SessionUser } from '../../shared/schemas/session';
import { canTransition, VISIT_REASON_LABELS } from '../../shared/visits';
import { completionProblems, unfinishedItems } from '../../shared/visit-completion';
import type { Db } from '../db/client';
import { customers, properties, technicians, visitChecklistItems, visitReadings, visitTroubleshooting, visits } from '../db/schema';
import { AppError, conflict } from '../http/errors';
import { notInHousehold } from '../http/ownership';
import { queueMail, type OutboxDeps } from '../mail/outbox';
import { summaryEmail, technicianCautions, visitPhotos, visitSummary } from './summary';
import {
  addressOf,
  companyInfo,
  equipmentLabel,
  fieldEquipment,
  propertyEquipment,
  visitCoverage,
  visitForStaff,
  visitListRows,
  type EquipmentRow,
  type VisitRow,
} from './visit-data';
import type { AppDeps } from '../deps';
import { saveVisitFindings } from '../visits/visit-notes';
import { changeVisitStatus } from '../visits/visit-status';
import { localDate } from '../company/company';

/** The signed-in technician's visits today (the owner sees every technician's), in time order. */
export async function todayVisits(deps: Pick<AppDeps, 'database' | 'clock'>, user: SessionUser): Promise<{ date: string; visits: TodayVisit[] }> {
  const { db } = deps.database;
  const now = deps.clock();
  const info = await companyInfo(db);
  const day = DateTime.fromJSDate(now, { zone: info.timeZone }).startOf('day');
  const inDay = and(gte(visits.startsAt, day.toJSDate()), lt(visits.startsAt, day.plus({ days: 1 }).toJSDate()), notInArray(visits.status, ['canceled']));
  let where = inDay;
  if (user.role === 'technician') {
    const [tech] = await db.select({ id: technicians.id }).from(technicians).where(eq(technicians.userId, user.id)).limit(1);
    if (!tech) return { date: day.toISODate()!, visits: [] };
    where = and(inDay, eq(visits.technicianId, tech.id));
  } else {
    where = and(inDay, ne(visits.status, 'requested'));
  }
  return { date: day.toISODate()!, visits: await visitListRows(db, where, info) };
}

const TROUBLESHOOTING_REASONS = new Set(['no_cooling', 'no_heat']);

function seasonFor(visit: VisitRow, onDate: string, seasons: SeasonSettings): Season {
  if (visit.reason === 'no_cooling') return 'cooling';
  if (visit.reason === 'no_heat') return 'heating';
  return tuneUpSeasonOf(onDate, seasons);
}

/**
 * One piece of equipment's items for the season, knowing the rest of the home's equipment (a
 * furnace with a cased coil gets the coil's items). The section builder and the save check both
 * use this, so every item shown can be saved.
 */
function checklistFor(e: EquipmentRow, season: Season, homeKinds: readonly string[]) {
  return tuneUpChecklist(e.kind as EquipmentKind, season, { casedCoil: furnaceHasCasedCoil(homeKinds) });
}

/** The visit's checklist as the visit screen shows it, for its own season. */
async function visitChecklist(db: Db, visit: VisitRow): Promise<ChecklistSection[]> {
  const info = await companyInfo(db);
  const items = await propertyEquipment(db, visit.propertyId);
  return checklistSections(db, visit.id, items, seasonFor(visit, localDate(visit.startsAt, info.timeZone), info.seasons));
}

async function checklistSections(db: Db, visitId: string, items: EquipmentRow[], season: Season): Promise<ChecklistSection[]> {
  const kinds = items.map((e) => e.kind);
  const saved = await db.select().from(visitChecklistItems).where(eq(visitChecklistItems.visitId, visitId));
  const key = (e: string, i: string) => `${e}/${i}`;
  const byKey = new Map(saved.map((s) => [key(s.equipmentId, s.itemId), s]));
  return items.map((e) => ({
    equipmentId: e.id,
    equipmentLabel: equipmentLabel(e),
    items: checklistFor(e, season, kinds).map((item) => {
      const s = byKey.get(key(e.id, item.id));
      return { ...item, result: s?.result ?? null, note: s?.note ?? '' };
    }),
  }));
}

function savedReadings(r: typeof visitReadings.$inferSelect): SavedReadings {
  return { equipmentId: r.equipmentId, readings: r.readings, checks: r.checks, worstStatus: r.worstStatus, recordedAt: r.recordedAt.toISOString() };
}

/** Everything the visit screen shows: header, coverage, checklist, troubleshooting, readings, cautions. */
export async function fieldVisit(deps: Pick<AppDeps, 'database' | 'clock'>, user: SessionUser, visitId: string, seasonOverride?: Season): Promise<FieldVisit> {
  const { db } = deps.database;
  const now = deps.clock();
  const visit = await visitForStaff(db, user, visitId);
  const info = await companyInfo(db);
  const [header] = await visitListRows(db, eq(visits.id, visit.id), info);
  const [customer] = await db.select({ id: customers.id, name: customers.name, phone: customers.phone }).from(customers).where(eq(customers.id, visit.customerId));
  const [property] = await db.select().from(properties).where(eq(properties.id, visit.propertyId));
  const onDate = localDate(visit.startsAt, info.timeZone);
  const today = localDate(now, info.timeZone);
  const items = await propertyEquipment(db, visit.propertyId);
  const season = seasonOverride ?? seasonFor(visit, onDate, info.seasons);
  const past = await db
    .select({ id: visits.id, startsAt: visits.startsAt, reason: visits.reason, findings: visits.findings, recommendations: visits.recommendations })
    .from(visits)
    .where(and(eq(visits.propertyId, visit.propertyId), eq(visits.status, 'done'), ne(visits.id, visit.id), lt(visits.startsAt, visit.startsAt)))
    .orderBy(desc(visits.startsAt))
    .limit(6);
  const [trouble] = await db.select().from(visitTroubleshooting).where(eq(visitTroubleshooting.visitId, visit.id));
  const readings = await db.select().from(visitReadings).where(eq(visitReadings.visitId, visit.id)).orderBy(asc(visitReadings.recordedAt));
  const { visitId: _v, updatedAt: _u, ...troubleshooting } = trouble ?? { visitId: '', updatedAt: null };

  return {
    visit: {
      ...header!,
      notes: visit.notes,
      symptoms: visit.symptoms,
      findings: visit.findings,
      recommendations: visit.recommendations,
      completedAt: visit.completedAt?.toISOString() ?? null,
      onDate,
    },
    customer: customer!,
    property: { id: property!.id, address: addressOf(property!), accessNotes: property!.accessNotes, elevationFt: property!.elevationFt },
    equipment: items.map((e) => fieldEquipment(e, today)),
    pastVisits: past.map((p) => ({
      id: p.id,
      onDate: localDate(p.startsAt, info.timeZone),
      reasonLabel: VISIT_REASON_LABELS[p.reason],
      findings: p.findings,
      recommendations: p.recommendations,
    })),
    coverage: await visitCoverage(db, visit, info),
    season,
    checklist: await checklistSections(db, visit.id, items, season),
    troubleshooting: trouble ? (troubleshooting as Troubleshooting) : null,
    troubleshootingKind: TROUBLESHOOTING_REASONS.has(visit.reason) ? (visit.reason as 'no_cooling' | 'no_heat') : null,
    readings: readings.map(savedReadings),
    photos: await visitPhotos(db, visit.id),
    cautions: technicianCautions(items),
  };
}

function assertOpen(visit: VisitRow): void {
  if (visit.status === 'done') throw conflict('This visit is already completed; its record can no longer be changed.');
  if (visit.status === 'canceled' || visit.status === 'no_show') throw conflict('This visit was canceled; nothing can be recorded on it.');
}

async function equipmentOnVisit(db: Db, visit: VisitRow, equipmentId: string, field: string): Promise<EquipmentRow> {
  const items = await propertyEquipment(db, visit.propertyId);
  const found = items.find((e) => e.id === equipmentId);
  if (!found) throw notInHousehold(field, 'That equipment');
  return found;
}

/**
 * The readings with what the equipment record knows filled in where the technician left it out:
 * compressor type, maximum frequency and maximum external static. The phone does the same, so
 * the live verdicts and the saved ones match.
 */
function withEquipmentDefaults(sent: VisitReadings, unit: EquipmentRow): VisitReadings {
  const readings: VisitReadings = { ...sent };
  if (readings.compressorType === undefined && unit.compressorType !== null) readings.compressorType = unit.compressorType;
  const variable = (readings.compressorType ?? unit.compressorType) === 'variable_speed';
  if (readings.maxCompressorHz === undefined && unit.maxCompressorHz !== null && variable) readings.maxCompressorHz = unit.maxCompressorHz;
  if (readings.maxExternalStaticInWc === undefined && unit.maxExternalStaticInWc !== null) readings.maxExternalStaticInWc = unit.maxExternalStaticInWc;
  return readings;
}

/**
 * Saves one system's readings. The server evaluates them again with the same engine and stores
 * what it computed; saving twice (a retry after a dropped signal) replaces the first copy.
 */
export async function saveReadings(deps: Pick<AppDeps, 'database' | 'clock'>, user: SessionUser, visitId: string, body: SaveReadings): Promise<SavedReadings> {
  const { db } = deps.database;
  const now = deps.clock();
  const visit = await visitForStaff(db, user, visitId);
  assertOpen(visit);
  const unit = await equipmentOnVisit(db, visit, body.equipmentId, 'equipmentId');
  const readings = withEquipmentDefaults(body.readings, unit);
  if (readings.altitudeFt === undefined) {
    const [p] = await db.select({ elevationFt: properties.elevationFt }).from(properties).where(eq(properties.id, visit.propertyId));
    if (p?.elevationFt !== null && p?.elevationFt !== undefined) readings.altitudeFt = p.elevationFt;
  }
  let checks;
  try {
    checks = evaluateReadings(readings);
  } catch (err) {
    if (err instanceof ReadingInputError) {
      throw new AppError(422, 'validation_failed', `Please check readings.${err.field}.`, { [`readings.${err.field}`]: err.message.replace(/^[^:]+: /, '') });
    }
    throw err;
  }
  const values = { visitId, propertyId: visit.propertyId, equipmentId: body.equipmentId, readings, checks, worstStatus: worstStatus(checks), recordedAt: now, recordedBy: user.id };
  const [row] = await db
    .insert(visitReadings)
    .values(values)
    .onConflictDoUpdate({
      target: [visitReadings.visitId, visitReadings.equipmentId],
      set: { readings, checks, worstStatus: values.worstStatus, recordedAt: now, recordedBy: user.id },
    })
    .returning();
  return savedReadings(row!);
}

/** Replaces the visit's checklist results with the ones sent, each checked against the season's list. */
export async function saveChecklist(deps: Pick<AppDeps, 'database'>, user: SessionUser, visitId: string, body: SaveChecklist): Promise<ChecklistSection[]> {
  const { db } = deps.database;
  const visit = await visitForStaff(db, user, visitId);
  assertOpen(visit);
  const items = await propertyEquipment(db, visit.propertyId);
  const byId = new Map(items.map((e) => [e.id, e]));
  const kinds = items.map((e) => e.kind);
  const seen = new Set<string>();
  body.items.forEach((it, i) => {
    const e = byId.get(it.equipmentId);
    if (!e) throw notInHousehold(`items.${i}.equipmentId`, 'That equipment');
    const known = checklistFor(e, body.season, kinds).some((c) => c.id === it.itemId);
    if (!known)
      throw new AppError(422, 'validation_failed', `Please check items.${i}.itemId.`, { [`items.${i}.itemId`]: `Not a ${body.season} checklist item for this equipment` });
    const k = `${it.equipmentId}/${it.itemId}`;
    if (seen.has(k)) throw new AppError(422, 'validation_failed', `Please check items.${i}.itemId.`, { [`items.${i}.itemId`]: 'This item appears twice' });
    seen.add(k);
  });
  await db.transaction(async (tx) => {
    await tx.delete(visitChecklistItems).where(eq(visitChecklistItems.visitId, visitId));
    if (body.items.length) await tx.insert(visitChecklistItems).values(body.items.map((it) => ({ visitId, ...it })));
  });
  return checklistSections(db, visitId, items, body.season);
}

export async function saveTroubleshooting(deps: Pick<AppDeps, 'database'>, user: SessionUser, visitId: string, body: Troubleshooting): Promise<Troubleshooting> {
  const { db } = deps.database;
  const visit = await visitForStaff(db, user, visitId);
  assertOpen(visit);
  await db
    .insert(visitTroubleshooting)
    .values({ visitId, ...body })
    .onConflictDoUpdate({ target: visitTroubleshooting.visitId, set: { ...body, updatedAt: new Date() } });
  return body;
}

export async function saveNotes(deps: Pick<AppDeps, 'database'>, user: SessionUser, visitId: string, body: VisitNotes): Promise<VisitNotes> {
  const { db } = deps.database;
  const visit = await visitForStaff(db, user, visitId);
  assertOpen(visit);
  await saveVisitFindings(db, visitId, body);
  return body;
}

/**
 * Completes the visit and e-mails the homeowner the plain-words summary. Completing again (a
 * retry after a dropped signal) answers with the visit as it is and sends nothing more.
 */
type CompleteDeps = Pick<AppDeps, 'config'> & OutboxDeps;

export async function completeVisit(deps: CompleteDeps, user: SessionUser, visitId: string, body: CompleteVisit, log: Logger = deps.logger): Promise<CompletedVisit> {
  const { db } = deps.database;
  const now = deps.clock();
  const open = await visitForStaff(db, user, visitId);
  if (canTransition(open.status, 'done')) {
    // A tune-up's open checklist items need a reason; a repair needs the homeowner's signature.
    const unfinished = open.reason === 'tune_up' ? unfinishedItems(await visitChecklist(db, open)) : [];
    const problems = completionProblems(unfinished, body);
    if (Object.keys(problems).length) throw new AppError(422, 'validation_failed', Object.values(problems)[0]!, problems);
  }
  const signed = body.repairDone && body.signature ? { signatureImage: body.signature.image, signedBy: body.signature.signedBy, signedAt: now } : {};
  // Only a visit the technician is on site for can be done (the shared transition table).
  const result = await db.transaction((tx) =>
    changeVisitStatus(tx, {
      visitId,
      to: 'done',
      actor: user.id,
      at: now,
      note: body.skippedReason ? `Completed on site; skipped items: ${body.skippedReason}` : 'Completed on site',
      changes: { completedAt: now, findings: body.findings, recommendations: body.recommendations, skippedReason: body.skippedReason, repairDone: body.repairDone, ...signed },
    }),
  );
  const visit = result.after;
  let summaryEmailed = false;
  if (result.changed) summaryEmailed = await sendSummary(deps, visit, log);
  return { id: visit.id, status: visit.status, completedAt: visit.completedAt!.toISOString(), summaryEmailed };
}

async function sendSummary(deps: CompleteDeps, visit: VisitRow, log: Logger): Promise<boolean> {
  const { db } = deps.database;
  const [c] = await db.select({ email: customers.email }).from(customers).where(eq(customers.id, visit.customerId));
  if (!c?.email) return false;
  const info = await companyInfo(db);
  const summary = await visitSummary(db, visit, info);
  const mail = summaryEmail(summary, info, `${deps.config.publicUrl}/portal/visits/${visit.id}`);
  try {
    return await queueMail(deps, { kind: 'visit_summary', key: `visit-summary:${visit.id}`, message: { to: c.email, ...mail } });
  } catch (err) {
    // The visit stays completed; the office can resend from the record.
    log.error({ err: (err as Error).message, visitId: visit.id }, 'visit summary e-mail was not queued');
    return false;
  }
}
