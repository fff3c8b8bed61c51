import { eq } from 'drizzle-orm';
import type { Db, Tx } from '../db/client';
import { technicianTimeOff } from '../db/schema';

export type TimeOffRow = typeof technicianTimeOff.$inferSelect;

/** Takes a stretch of a technician's time out of the arrival windows (the schedule version trigger follows). */
export async function insertTimeOff(db: Db | Tx, input: { technicianId: string; startsAt: Date; endsAt: Date; reason: string }): Promise<TimeOffRow> {
  const [row] = await db.insert(technicianTimeOff).values(input).returning();
  return row!;
}

/** Gives the time back; false when there was no such time off. */
export async function deleteTimeOff(db: Db | Tx, id: string): Promise<boolean> {
  const rows = await db.delete(technicianTimeOff).where(eq(technicianTimeOff.id, id)).returning({ id: technicianTimeOff.id });
  return rows.length > 0;
}
