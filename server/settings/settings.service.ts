import { eq } from 'drizzle-orm';
import type { CompanySettings } from '../../shared/schemas/settings';
import { company } from '../db/schema';
import { recordAudit } from '../audit/audit.service';
import { notFound } from '../http/errors';
import type { AppDeps } from '../deps';

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

export async function getCompanySettings(deps: Pick<AppDeps, 'database'>): Promise<CompanySettings> {
  const { db } = deps.database;
  const [row] = await db.select(columns).from(company).where(eq(company.id, 1));
  if (!row) throw notFound('The company record');
  return row;
}

export async function updateCompanySettings(deps: Pick<AppDeps, 'database' | 'clock'>, actorId: string, next: CompanySettings): Promise<CompanySettings> {
  const { db } = deps.database;
  const now = deps.clock();
  return db.transaction(async (tx) => {
    const [row] = await tx.update(company).set({ ...next, updatedAt: now }).where(eq(company.id, 1)).returning(columns);
    if (!row) throw notFound('The company record');
    await recordAudit(tx, { actorUserId: actorId, action: 'settings_changed', subject: 'company', details: { name: next.name, taxRateBps: next.taxRateBps }, at: now });
    return row;
  });
}
