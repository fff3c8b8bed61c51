import { eq } from 'drizzle-orm';
import type { Db, Tx } from '../db/client';
import { visits } from '../db/schema';

/** The technician's findings and recommendations on a visit; the caller has checked the visit is theirs and open. */
export async function saveVisitFindings(db: Db | Tx, visitId: string, notes: { findings: string; recommendations: string }): Promise<void> {
  await db.update(visits).set({ findings: notes.findings, recommendations: notes.recommendations, updatedAt: new Date() }).where(eq(visits.id, visitId));
}
