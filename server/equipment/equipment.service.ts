import { and, asc, eq, inArray, isNull } from 'drizzle-orm';
import { EQUIPMENT_KIND_LABELS } from '../../shared/equipment';
import type { Equipment, EquipmentInput, EquipmentUpdate } from '../../shared/schemas/equipment';
import { BTUH_PER_TON } from '../../shared/schemas/equipment';
import { ageText, assessServiceLife, warrantyStatus, WARRANTY_STATUS_LABELS } from '../../shared/service-life';
import type { SessionUser } from '../../shared/schemas/session';
import { assertCustomerAccess } from '../auth/access';
import type { Db, Tx } from '../db/client';
import { equipment, properties } from '../db/schema';
import { AppError, notFound } from '../http/errors';
import { ownedProperty } from '../http/ownership';
import { companyToday } from '../company/company';
import type { AppDeps } from '../deps';

export type EquipmentRow = typeof equipment.$inferSelect;

/** The row as the API shows it, with age, service-life flag and warranty worked out for today. */
export function toEquipment(row: EquipmentRow, today: string): Equipment {
  // An install date after today is refused on write; older rows still get an answer rather than an error.
  const installed = row.installedOn && row.installedOn <= today ? row.installedOn : null;
  const life = assessServiceLife(row.kind, installed, today);
  const warranty = warrantyStatus(row.warrantyEndsOn, today);
  return {
    id: row.id,
    propertyId: row.propertyId,
    kind: row.kind,
    kindLabel: EQUIPMENT_KIND_LABELS[row.kind],
    make: row.make,
    model: row.model,
    serial: row.serial,
    installedOn: row.installedOn,
    refrigerant: row.refrigerant,
    capacityBtuh: row.capacityBtuh,
    capacityTons: row.capacityBtuh === null ? null : Math.round((row.capacityBtuh / BTUH_PER_TON) * 100) / 100,
    volts: row.volts,
    phase: row.phase,
    ratedAmps: row.ratedAmps,
    filterSize: row.filterSize,
    filterType: row.filterType,
    merv: row.merv,
    warrantyEndsOn: row.warrantyEndsOn,
    warranty,
    warrantyLabel: WARRANTY_STATUS_LABELS[warranty],
    location: row.location,
    notes: row.notes,
    compressorType: row.compressorType,
    maxCompressorHz: row.maxCompressorHz,
    maxExternalStaticInWc: row.maxExternalStaticInWc,
    ageText: life.age ? ageText(life.age) : null,
    ageYears: life.age ? life.age.years : null,
    life: { status: life.status, label: life.label, typicalYears: life.typicalYears, source: life.source },
    archived: row.archivedAt !== null,
  };
}

function assertNotFuture(installedOn: string | null | undefined, today: string) {
  if (installedOn && installedOn > today) throw new AppError(422, 'validation_failed', 'Please check installedOn.', { installedOn: 'Install date cannot be after today.' });
}

async function propertyFor(db: Db | Tx, user: SessionUser, propertyId: string) {
  const [p] = await db.select().from(properties).where(eq(properties.id, propertyId)).limit(1);
  if (!p) throw notFound('That property');
  await assertCustomerAccess(db, user, p.customerId).catch(() => {
    throw notFound('That property');
  });
  return p;
}

async function equipmentFor(db: Db | Tx, user: SessionUser, id: string) {
  const [row] = await db
    .select({ e: equipment, customerId: properties.customerId })
    .from(equipment)
    .innerJoin(properties, eq(equipment.propertyId, properties.id))
    .where(eq(equipment.id, id))
    .limit(1);
  if (!row) throw notFound('That equipment');
  await assertCustomerAccess(db, user, row.customerId).catch(() => {
    throw notFound('That equipment');
  });
  return row;
}

export async function listPropertyEquipment(deps: Pick<AppDeps, 'database' | 'clock'>, user: SessionUser, propertyId: string, includeArchived = false): Promise<Equipment[]> {
  const { db } = deps.database;
  await propertyFor(db, user, propertyId);
  const rows = await db
    .select()
    .from(equipment)
    .where(and(eq(equipment.propertyId, propertyId), includeArchived ? undefined : isNull(equipment.archivedAt)))
    .orderBy(asc(equipment.createdAt), asc(equipment.id));
  const today = await companyToday(deps);
  return rows.map((r) => toEquipment(r, today));
}

export async function equipmentForProperties(db: Db | Tx, propertyIds: string[], today: string, includeArchived = false): Promise<Equipment[]> {
  if (!propertyIds.length) return [];
  const rows = await db
    .select()
    .from(equipment)
    .where(and(inArray(equipment.propertyId, propertyIds), includeArchived ? undefined : isNull(equipment.archivedAt)))
    .orderBy(asc(equipment.createdAt), asc(equipment.id));
  return rows.map((r) => toEquipment(r, today));
}

export async function createEquipment(deps: Pick<AppDeps, 'database' | 'clock'>, user: SessionUser, propertyId: string, input: EquipmentInput): Promise<Equipment> {
  const { db } = deps.database;
  const p = await ownedProperty(db, user, propertyId, 'propertyId', { archivedToo: true });
  if (p.archivedAt) throw new AppError(409, 'archived', 'That property is archived; restore it before adding equipment.');
  const today = await companyToday(deps);
  assertNotFuture(input.installedOn, today);
  const [row] = await db
    .insert(equipment)
    .values({ ...input, propertyId })
    .returning();
  return toEquipment(row!, today);
}

export async function getEquipment(deps: Pick<AppDeps, 'database' | 'clock'>, user: SessionUser, id: string): Promise<Equipment> {
  const { db } = deps.database;
  const { e } = await equipmentFor(db, user, id);
  return toEquipment(e, await companyToday(deps));
}

export async function updateEquipment(deps: Pick<AppDeps, 'database' | 'clock'>, user: SessionUser, id: string, input: EquipmentUpdate): Promise<Equipment> {
  const { db } = deps.database;
  const { e } = await equipmentFor(db, user, id);
  const today = await companyToday(deps);
  assertNotFuture(input.installedOn, today);
  const installedOn = input.installedOn !== undefined ? input.installedOn : e.installedOn;
  const warrantyEndsOn = input.warrantyEndsOn !== undefined ? input.warrantyEndsOn : e.warrantyEndsOn;
  if (installedOn && warrantyEndsOn && warrantyEndsOn < installedOn)
    throw new AppError(422, 'validation_failed', 'Please check warrantyEndsOn.', { warrantyEndsOn: 'Warranty end is after the install date.' });
  // A maximum frequency belongs to a variable-speed compressor, whichever of the two the change sends.
  const compressorType = input.compressorType !== undefined ? input.compressorType : e.compressorType;
  const maxCompressorHz = input.maxCompressorHz !== undefined ? input.maxCompressorHz : e.maxCompressorHz;
  if (maxCompressorHz != null && compressorType != null && compressorType !== 'variable_speed') {
    throw new AppError(422, 'validation_failed', 'Please check maxCompressorHz.', { maxCompressorHz: 'Maximum compressor frequency is for a variable-speed compressor.' });
  }
  const [row] = await db.update(equipment).set(input).where(eq(equipment.id, id)).returning();
  return toEquipment(row!, today);
}

/** Equipment is archived, never deleted: readings, photos and visits still point at it. */
export async function setEquipmentArchived(deps: Pick<AppDeps, 'database' | 'clock'>, user: SessionUser, id: string, archived: boolean): Promise<Equipment> {
  const { db } = deps.database;
  const now = deps.clock();
  await equipmentFor(db, user, id);
  const [row] = await db
    .update(equipment)
    .set({ archivedAt: archived ? now : null })
    .where(eq(equipment.id, id))
    .returning();
  return toEquipment(row!, await companyToday(deps));
}

/** A unit a bulk import adds; the import has checked and matched it, inside its own transaction. */
export async function insertImportedEquipment(tx: Tx, propertyId: string, input: EquipmentInput): Promise<void> {
  await tx.insert(equipment).values({ ...input, propertyId });
}
