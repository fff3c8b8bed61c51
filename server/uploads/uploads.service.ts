import { and, eq, inArray, isNull } from 'drizzle-orm';
import { fileTypeFromBuffer } from 'file-type';
import sharp from 'sharp';
import * as z from 'zod';
import { FILE_CATEGORIES, type StoredFile } from '../../shared/schemas/customers';
import type { SessionUser } from '../../shared/schemas/session';
import { assertCustomerAccess } from '../auth/access';
import { toFile } from '../customers/customer-views';
import type { Db, Tx } from '../db/client';
import { files } from '../db/schema';
import { AppError, notFound } from '../http/errors';
import { notInHousehold, ownedCustomer, ownedEquipment, ownedProperty, ownedVisit } from '../http/ownership';
import { newStorageKey } from '../integrations/storage';
import type { AppDeps } from '../deps';

/** What we accept, decided from the bytes themselves: the name and the sent header are ignored. */
const ACCEPTED: Record<string, string> = { 'image/jpeg': 'jpg', 'image/png': 'png', 'image/webp': 'webp', 'application/pdf': 'pdf' };
const MAX_EDGE = 4096;
const THUMB_EDGE = 400;

const blankToUndefined = (v: unknown) => (v === '' ? undefined : v);
export const uploadTargetSchema = z
  .object({
    customerId: z.preprocess(blankToUndefined, z.uuid({ error: 'Choose the household.' }).optional()),
    propertyId: z.preprocess(blankToUndefined, z.uuid({ error: 'Choose the property.' }).optional()),
    equipmentId: z.preprocess(blankToUndefined, z.uuid({ error: 'Choose the equipment.' }).optional()),
    visitId: z.preprocess(blankToUndefined, z.uuid({ error: 'Choose the visit.' }).optional()),
    category: z.enum(FILE_CATEGORIES, { error: `Category is one of ${FILE_CATEGORIES.join(', ')}.` }).default('other'),
    caption: z.preprocess(blankToUndefined, z.string().trim().max(200, 'Keep the caption under 200 characters.').default('')),
  })
  .refine((t) => t.customerId || t.propertyId || t.equipmentId || t.visitId, {
    error: 'Say which household, property, equipment or visit the files belong to.',
    path: ['customerId'],
  });
export type UploadTarget = z.infer<typeof uploadTargetSchema>;

export interface IncomingFile {
  originalname: string;
  buffer: Buffer;
  size: number;
}

interface Prepared {
  contentType: string;
  body: Buffer;
  thumb: Buffer | null;
  width: number | null;
  height: number | null;
  ext: string;
  originalName: string;
}

/** Keeps a name people recognise, without path parts or control characters. */
export function cleanName(name: string, ext: string): string {
  const base = (name.split(/[\\/]/).pop() ?? '')
    // eslint-disable-next-line no-control-regex -- control characters are what a file name must lose
    .replace(/[\u0000-\u001f\u007f"<>|:*?]/g, '')
    .trim()
    .slice(0, 120);
  const stem = base.replace(/\.[^.]*$/, '') || 'file';
  return `${stem}.${ext}`;
}

/** Checks the content and re-encodes images, which drops EXIF (GPS position included) and other metadata. */
async function prepare(file: IncomingFile): Promise<Prepared> {
  const detected = await fileTypeFromBuffer(file.buffer);
  const ext = detected ? ACCEPTED[detected.mime] : undefined;
  if (!detected || !ext) {
    throw new AppError(415, 'unsupported_type', `"${cleanName(file.originalname, 'x').replace(/\.x$/, '')}" is not a JPEG, PNG, WebP or PDF file.`, {
      files: 'Only JPEG, PNG and WebP photos and PDF documents are accepted.',
    });
  }
  if (detected.mime === 'application/pdf') {
    return { contentType: detected.mime, body: file.buffer, thumb: null, width: null, height: null, ext, originalName: cleanName(file.originalname, ext) };
  }
  try {
    // rotate() applies the camera's orientation before the EXIF block that carried it is dropped.
    const pipeline = sharp(file.buffer, { failOn: 'error', limitInputPixels: 80_000_000 }).rotate().resize(MAX_EDGE, MAX_EDGE, { fit: 'inside', withoutEnlargement: true });
    const encoded =
      detected.mime === 'image/png'
        ? pipeline.png({ compressionLevel: 9 })
        : detected.mime === 'image/webp'
          ? pipeline.webp({ quality: 85 })
          : pipeline.jpeg({ quality: 85, mozjpeg: true });
    const { data, info } = await encoded.toBuffer({ resolveWithObject: true });
    const thumb = await sharp(data).resize(THUMB_EDGE, THUMB_EDGE, { fit: 'inside', withoutEnlargement: true }).webp({ quality: 75 }).toBuffer();
    return { contentType: detected.mime, body: data, thumb, width: info.width, height: info.height, ext, originalName: cleanName(file.originalname, ext) };
  } catch {
    throw new AppError(415, 'unreadable_image', `"${cleanName(file.originalname, ext)}" could not be read as an image.`, { files: 'That image is damaged or not complete.' });
  }
}

/** Works out the household from the most specific thing named, and that they all agree. */
async function resolveTarget(
  db: Db,
  user: SessionUser,
  t: UploadTarget,
): Promise<{ customerId: string; propertyId: string | null; equipmentId: string | null; visitId: string | null }> {
  // Each id the form names must be reachable by the caller, and all of them in one household.
  let customerId = t.customerId ? (await ownedCustomer(db, user, t.customerId, 'customerId', { archivedToo: true })).id : null;
  let propertyId = t.propertyId ?? null;
  if (t.equipmentId) {
    const e = await ownedEquipment(db, user, t.equipmentId, 'equipmentId', { within: customerId ?? undefined, archivedToo: true });
    if (propertyId && propertyId !== e.propertyId) throw notInHousehold('propertyId', 'That property');
    propertyId = e.propertyId;
    customerId = e.customerId;
  }
  if (t.visitId) {
    const v = await ownedVisit(db, user, t.visitId, 'visitId', { within: customerId ?? undefined });
    customerId = v.customerId;
    propertyId ??= v.propertyId;
  }
  if (propertyId && !t.equipmentId) customerId = (await ownedProperty(db, user, propertyId, 'propertyId', { within: customerId ?? undefined, archivedToo: true })).customerId;
  if (!customerId) throw notInHousehold('customerId', 'That household');
  return { customerId, propertyId, equipmentId: t.equipmentId ?? null, visitId: t.visitId ?? null };
}

/**
 * Stores a batch of uploads: every file is checked and re-encoded first, then stored under fresh
 * keys, then recorded in one transaction. Any failure removes what was stored, so a rejected
 * upload leaves nothing behind.
 */
export async function storeUploads(
  deps: Pick<AppDeps, 'database' | 'clock' | 'storage'>,
  user: SessionUser,
  target: UploadTarget,
  incoming: IncomingFile[],
): Promise<StoredFile[]> {
  const { db } = deps.database;
  const { storage } = deps;
  const now = deps.clock();
  if (!incoming.length) throw new AppError(422, 'validation_failed', 'Please check files.', { files: 'Choose at least one file to upload.' });
  const where = await resolveTarget(db, user, target);
  const prepared: Prepared[] = [];
  for (const f of incoming) prepared.push(await prepare(f));

  const written: string[] = [];
  try {
    const rows: (typeof files.$inferInsert)[] = [];
    for (const p of prepared) {
      const storageKey = newStorageKey(now, p.ext);
      await storage.put(storageKey, p.body, p.contentType);
      written.push(storageKey);
      let thumbKey: string | null = null;
      if (p.thumb) {
        thumbKey = storageKey.replace(/\.[a-z]+$/, '.thumb.webp');
        await storage.put(thumbKey, p.thumb, 'image/webp');
        written.push(thumbKey);
      }
      rows.push({
        ...where,
        storageKey,
        thumbKey,
        category: target.category,
        caption: target.caption,
        contentType: p.contentType,
        originalName: p.originalName,
        sizeBytes: p.body.length,
        width: p.width,
        height: p.height,
        uploadedByUserId: user.id,
      });
    }
    const inserted = await db.transaction((tx) => tx.insert(files).values(rows).returning());
    return inserted.map(toFile);
  } catch (err) {
    await Promise.all(written.map((k) => storage.delete(k).catch(() => undefined)));
    throw err;
  }
}

export async function fileFor(deps: Pick<AppDeps, 'database'>, user: SessionUser, id: string) {
  const { db } = deps.database;
  const [f] = await db.select().from(files).where(eq(files.id, id)).limit(1);
  if (!f) throw notFound('That file');
  await assertCustomerAccess(db, user, f.customerId).catch(() => {
    throw notFound('That file');
  });
  return f;
}

/** Archived files drop out of lists but keep their bytes: a record with history is never lost. */
export async function archiveFile(deps: Pick<AppDeps, 'database' | 'clock'>, user: SessionUser, id: string): Promise<void> {
  const { db } = deps.database;
  const now = deps.clock();
  const f = await fileFor(deps, user, id);
  await db
    .update(files)
    .set({ archivedAt: now })
    .where(and(eq(files.id, f.id)));
}

export async function listFiles(deps: Pick<AppDeps, 'database'>, user: SessionUser, customerId: string): Promise<StoredFile[]> {
  const { db } = deps.database;
  await assertCustomerAccess(db, user, customerId);
  const rows = await db.select().from(files).where(eq(files.customerId, customerId));
  return rows.filter((r) => !r.archivedAt).map(toFile);
}

/**
 * Links the homeowner's booking photos to the new visit, so the technician's visit page shows them.
 * Only the booking household's own, unarchived, not yet linked files are taken; any other id is
 * refused and nothing is linked (another household's file id answers the same as a missing one).
 */
export async function linkFilesToVisit(tx: Db | Tx, target: { customerId: string; visitId: string }, fileIds: string[]): Promise<void> {
  await attachOwnedFiles(tx, target, fileIds, 'photoIds');
}

/**
 * Attaches uploaded files to a visit: each must belong to the visit's household, be live and not
 * yet on another visit. One conditional update, so a file cannot be taken twice; a shortfall
 * throws inside the caller's transaction, undoing the visit and the links together.
 */
export async function attachOwnedFiles(tx: Db | Tx, target: { customerId: string; visitId: string }, fileIds: readonly string[], field: string): Promise<void> {
  const ids = [...new Set(fileIds)];
  if (!ids.length) return;
  const linked = await tx
    .update(files)
    .set({ visitId: target.visitId })
    .where(and(inArray(files.id, ids), eq(files.customerId, target.customerId), isNull(files.archivedAt), isNull(files.visitId)))
    .returning({ id: files.id });
  if (linked.length !== ids.length) throw notInHousehold(field, 'A photo');
}
