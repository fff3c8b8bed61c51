import { eq } from 'drizzle-orm';
import type { CompanySettings } from '../../shared/schemas/settings';
import type { Db } from '../db/client';
import { company } from '../db/schema';
import { recordAudit } from '../audit/audit.service';
import { notFound } from '../http/errors';

const columns = {
  name: company.name,
  phone: company.phone,
  email: company.email,
  street: company.street,
  city: company.city,
  state: company.state,
  zip: company.zip,
  timeZone: company.timeZone,
  taxRateBps: company.taxRateBps,
  businessHours: company.businessHours,
  arrivalWindowMinutes: company.arrivalWindowMinutes,
  leadTimeMinutes: company.leadTimeMinutes,
  heldBackPct: company.heldBackPct,
  cancelCutoffHours: company.cancelCutoffHours,
  diagnosticFeeCents: company.diagnosticFeeCents,
};

export async function getCompanySettings(db: Db): Promise<CompanySettings> {
  const [row] = await db.select(columns).from(company).where(eq(company.id, 1));
  if (!row) throw notFound('The company record');
  return row;
}

export async function updateCompanySettings(db: Db, actorId: string, next: CompanySettings, now: Date): Promise<CompanySettings> {
  return db.transaction(async (tx) => {
    const [row] = await tx.update(company).set({ ...next, updatedAt: now }).where(eq(company.id, 1)).returning(columns);
    if (!row) throw notFound('The company record');
    await recordAudit(tx, { actorUserId: actorId, action: 'settings_changed', subject: 'company', details: { name: next.name, taxRateBps: next.taxRateBps }, at: now });
    return row;
  });
}
